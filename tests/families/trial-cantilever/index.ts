/**
 * A made-up family, registered by tests/api/family-registry.test.ts: four files in one folder, exactly as
 * DEVELOPERS.md ("Adding a module family") tells a maintainer, with its own fast estimator and
 * design-map sweep. Nothing outside this folder names it.
 */
import { defineFamily } from '../../../catalog/schema/define'
import type { FastEstimator } from '../../../catalog/schema/types'
import * as geometry from './geometry'
import * as model from './model'
import { stiffnessOf, strainPerMm, travelOf } from './model'
import * as params from './params'

const keys = ['stiffness', 'maxTravel', 'maxStrain', 'safetyFactor'] as const

/** The closed form itself, in the raw-slot form search and the design map run. */
const estimator: FastEstimator = {
  method: 'linear',
  reproduces: 'linear',
  exact: true,
  layout: { keys, modulusPower: [1, 0, 0, 0], booleans: [false, false, false, false], emptyFixed: [true, true, true, true] },
  fill: (p, E, limit, out) => {
    const travel = travelOf(p, limit)
    out[0] = stiffnessOf(p, E)
    out[1] = travel
    out[2] = travel * strainPerMm(p)
    out[3] = limit / out[2]
    return true
  },
  estimate: (p, E, limit) => {
    const travel = travelOf(p, limit)
    const strain = travel * strainPerMm(p)
    return { stiffness: stiffnessOf(p, E), maxTravel: travel, maxStrain: strain, safetyFactor: limit / strain }
  },
}

export const trialCantilever = defineFamily({
  id: 'trial-cantilever',
  name: 'Trial cantilever spring',
  kind: 'spring',
  summary: 'A single straight blade on a base block, loaded at its tip: made up for the registry test.',
  search: { estimator },
  designMap: { sweep: ['length', 'thickness'] },
  cautions: ['Estimates from linear beam theory; confirm on printed parts. Polymers creep and fatigue: keep the strain safety factor well above 1.'],
}, { params, model, geometry })
