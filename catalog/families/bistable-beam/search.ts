/**
 * Search's fast estimate of the bistable pair: the precomputed table (table.ts) read straight
 * into the slots, without a record per candidate; within the table's measured error of the
 * nonlinear-fe method (tolerance.ts states it per metric for confirmations).
 */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { fillFromTable } from './table'
import { bistableTable } from './table-store'

/** The slot order of fillFromTable. */
const LAYOUT = layoutOf([
  ['peakForce', 1], ['valleyForce', 1], ['unstablePosition', 0, 'empties with the walls'], ['secondStablePosition', 0, 'empties with the walls'],
  ['energyIn', 1, 'empties with the walls'], ['energyBarrier', 1, 'empties with the walls'],
  ['bistable', 'boolean'], ['maxStrain', 0], ['strainLimit', 0], ['safetyFactor', 0],
])

export const estimator = dedicatedEstimator('table', 'nonlinear-fe', false, LAYOUT,
  (p, E, limit, out, bending) => fillFromTable(bistableTable(), p.span, p.apexHeight, p.thickness, p.depth, p.postLength, bendingModulus(E, bending, p.depth, p.thickness), limit, out),
  'outside the precomputed bistable table',
  // forces ∝ depth (the table's force scale E·b·t³·h/L³; the wide-beam factor only rises with depth); positions, strain and bistability do not depend on it
  ['depth'])
