/**
 * Fast estimators for search: the family's cheap method reduced to the metrics, so that
 * hundreds of thousands of candidates can be judged per second. A family without a dedicated
 * estimator is estimated by its own fast method through its model (exact with respect to that
 * method, only slower). Dedicated ones call the family's exported formulas, and a test checks
 * each against the family's evaluate.
 */
import type { FamilyDefinition, MetricValue } from '../schema/types'
import { linearStiffness, linearStrain, linearTravelRange, parasiticShortening } from '../families/parallel-guide/model'
import { castiglianoStiffness, linearStrainAtForce, travelCap } from '../families/serpentine-spring/model'
import { neckStrain, parosWeisbordCompliance, rotationRange } from '../families/notch-hinge/model'
import { deflectionForce, rootStrainAt, wedgeForce } from '../families/snap-hook/model'
import { evaluate as leafHingeModel, geometryOf, prbmRotationalStiffness } from '../families/leaf-hinge/model'

export type Estimate = Record<string, MetricValue>
export type EstimateFn = (params: Record<string, number>, modulus: number, strainLimit: number) => Estimate

export interface FastEstimator {
  /** The family method the estimate reproduces (reported with every result). */
  method: string
  estimate: EstimateFn
}

const DEG = 180 / Math.PI

/**
 * The leaf hinge's range metrics (largest rotation, drift, strain) come from a root search in
 * its model and do not depend on the modulus or the depth (strain and drift are geometric), so
 * they are memoised by (length, thickness, linkLength, strain limit) and taken from the
 * family's own model; the stiffness is its closed form. A test holds this to the model.
 */
const LEAF_MEMO_LIMIT = 50000
const leafRangeMemo = new Map<string, Estimate>()
function leafRange(p: Record<string, number>, limit: number): Estimate {
  const key = `${p.length}|${p.thickness}|${p.linkLength}|${limit}`
  let hit = leafRangeMemo.get(key)
  if (!hit) {
    const m = leafHingeModel({ params: p, material: { id: null, name: '', modulus: 1000, strainLimit: limit }, method: 'prbm' }).metrics
    hit = { maxRotation: m.maxRotation, pivotDrift: m.pivotDrift, maxStrain: m.maxStrain, safetyFactor: m.safetyFactor }
    if (leafRangeMemo.size >= LEAF_MEMO_LIMIT) leafRangeMemo.clear()
    leafRangeMemo.set(key, hit)
  }
  return hit
}

/** Family id → dedicated estimator. Each reproduces the named method's metrics. */
export const dedicatedEstimators: Readonly<Record<string, FastEstimator>> = Object.freeze({
  'parallel-guide': {
    method: 'linear',
    estimate: (p, E, limit) => {
      const range = linearTravelRange(p, limit)
      const strain = linearStrain(p, range.maxTravel)
      return { stiffness: linearStiffness(p, E), maxTravel: range.maxTravel, parasiticMotion: parasiticShortening(p.length, range.maxTravel), maxStrain: strain, safetyFactor: limit / strain }
    },
  },
  'serpentine-spring': {
    method: 'castigliano',
    estimate: (p, E, limit) => {
      const k = castiglianoStiffness(p.spans, p.spanLength, p.pitch, (E * p.depth * p.thickness ** 3) / 12)
      const perMm = linearStrainAtForce(p, E, k)
      const maxTravel = Math.min(limit / perMm, travelCap(p))
      return { stiffness: k, maxTravel, maxStrain: perMm * maxTravel, safetyFactor: limit / (perMm * maxTravel) }
    },
  },
  'notch-hinge': {
    method: 'paros-weisbord',
    estimate: (p, E, limit) => {
      const compliance = parosWeisbordCompliance(E, p.depth, p.radius, p.neckThickness)
      const range = rotationRange(compliance, E, p.depth, p.neckThickness, limit)
      const strain = neckStrain(range.maxRotation / compliance, E, p.depth, p.neckThickness)
      return { rotationalStiffness: 1 / compliance, maxRotation: range.maxRotation * DEG, maxStrain: strain, safetyFactor: limit / strain }
    },
  },
  'snap-hook': {
    method: 'snap-fit-equations',
    estimate: (p, E, limit) => {
      const ratio = p.tipThickness / p.rootThickness
      const P = deflectionForce(E, p.width, p.rootThickness, p.length, p.undercut, ratio)
      const strain = rootStrainAt(p.undercut, p.length, p.rootThickness, ratio)
      return {
        deflectionForce: P, matingForce: wedgeForce(P, p.friction, p.entryAngle), separationForce: wedgeForce(P, p.friction, p.retainAngle),
        rootStrain: strain, strainLimit: limit, safetyFactor: limit / strain,
      }
    },
  },
  'leaf-hinge': {
    method: 'prbm',
    estimate: (p, E, limit) => ({ rotationalStiffness: prbmRotationalStiffness(geometryOf(p), E), ...leafRange(p, limit) }),
  },
})

const EXACT_METHOD = 'nonlinear-fe'

/** The cheap method of a family: the first that is not the nonlinear solver. */
export function fastMethodOf(family: FamilyDefinition): string {
  return (family.methods.find((m) => m.id !== EXACT_METHOD) ?? family.methods[0]).id
}

/** The method used to confirm results: the nonlinear solver when the family has it. */
export function exactMethodOf(family: FamilyDefinition): string {
  return family.methods.some((m) => m.id === EXACT_METHOD) ? EXACT_METHOD : family.defaultMethod
}

export function estimatorFor(family: FamilyDefinition): FastEstimator {
  const dedicated = dedicatedEstimators[family.id]
  if (dedicated && family.methods.some((m) => m.id === dedicated.method)) return dedicated
  const method = fastMethodOf(family)
  return {
    method,
    estimate: (params, modulus, strainLimit) =>
      family.evaluate({ params, material: { id: null, name: '', modulus, strainLimit }, method }).metrics,
  }
}
