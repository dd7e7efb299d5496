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
import { evaluate as leafHingeModel } from '../families/leaf-hinge/model'
import { estimateBistable } from '../families/bistable-beam/estimate'

export type Estimate = Record<string, MetricValue>
export type EstimateFn = (params: Record<string, number>, modulus: number, strainLimit: number) => Estimate

export interface FastEstimator {
  /** How the estimate is made (reported with every result). */
  method: string
  /** The family method it reproduces: exactly for closed forms, within the table's error for tables. */
  reproduces: string
  /** True when it equals `reproduces` to rounding; false for interpolated tables. */
  exact: boolean
  estimate: EstimateFn
}

const DEG = 180 / Math.PI

/**
 * The leaf hinge's metrics come from a root search in its model. Moment scales with E·b and
 * every other metric (rotation, drift, strain) is geometric, independent of the modulus and the
 * depth; so the family's own model is run once per (length, thickness, linkLength, strain
 * limit) at a reference modulus and unit depth, memoised, and the stiffness scaled by E·b.
 * A test holds this to the model.
 */
const LEAF_MEMO_LIMIT = 50000
const LEAF_REFERENCE_MODULUS = 1000
const leafMemo = new Map<string, Estimate>()
function leafHingeEstimate(p: Record<string, number>, E: number, limit: number): Estimate {
  const key = `${p.length}|${p.thickness}|${p.linkLength}|${limit}`
  let unit = leafMemo.get(key)
  if (!unit) {
    unit = leafHingeModel({ params: { ...p, depth: 1 }, material: { id: null, name: '', modulus: LEAF_REFERENCE_MODULUS, strainLimit: limit }, method: 'prbm' }).metrics
    if (leafMemo.size >= LEAF_MEMO_LIMIT) leafMemo.clear()
    leafMemo.set(key, unit)
  }
  return { ...unit, rotationalStiffness: ((unit.rotationalStiffness as number) * E * p.depth) / LEAF_REFERENCE_MODULUS }
}

/** Family id → dedicated estimator. Each reproduces the named method's metrics. */
export const dedicatedEstimators: Readonly<Record<string, FastEstimator>> = Object.freeze({
  'parallel-guide': {
    method: 'linear',
    reproduces: 'linear',
    exact: true,
    estimate: (p, E, limit) => {
      const range = linearTravelRange(p, limit)
      const strain = linearStrain(p, range.maxTravel)
      return { stiffness: linearStiffness(p, E), maxTravel: range.maxTravel, parasiticMotion: parasiticShortening(p.length, range.maxTravel), maxStrain: strain, safetyFactor: limit / strain }
    },
  },
  'serpentine-spring': {
    method: 'castigliano',
    reproduces: 'castigliano',
    exact: true,
    estimate: (p, E, limit) => {
      const k = castiglianoStiffness(p.spans, p.spanLength, p.pitch, (E * p.depth * p.thickness ** 3) / 12)
      const perMm = linearStrainAtForce(p, E, k)
      const maxTravel = Math.min(limit / perMm, travelCap(p))
      return { stiffness: k, maxTravel, maxStrain: perMm * maxTravel, safetyFactor: limit / (perMm * maxTravel) }
    },
  },
  'notch-hinge': {
    method: 'paros-weisbord',
    reproduces: 'paros-weisbord',
    exact: true,
    estimate: (p, E, limit) => {
      const compliance = parosWeisbordCompliance(E, p.depth, p.radius, p.neckThickness)
      const range = rotationRange(compliance, E, p.depth, p.neckThickness, limit)
      const strain = neckStrain(range.maxRotation / compliance, E, p.depth, p.neckThickness)
      return { rotationalStiffness: 1 / compliance, maxRotation: range.maxRotation * DEG, maxStrain: strain, safetyFactor: limit / strain }
    },
  },
  'snap-hook': {
    method: 'snap-fit-equations',
    reproduces: 'snap-fit-equations',
    exact: true,
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
  'bistable-beam': {
    method: 'table',
    reproduces: 'nonlinear-fe',
    exact: false,
    estimate: (p, E, limit) => {
      const e = estimateBistable({ span: p.span, apexHeight: p.apexHeight, thickness: p.thickness, depth: p.depth, postLength: p.postLength }, { modulus: E, strainLimit: limit })
      if (!e) throw new RangeError('outside the precomputed bistable table')
      return e
    },
  },
  'leaf-hinge': {
    method: 'prbm',
    reproduces: 'prbm',
    exact: true,
    estimate: leafHingeEstimate,
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
  if (dedicated && family.methods.some((m) => m.id === dedicated.reproduces)) return dedicated
  const method = fastMethodOf(family)
  return {
    method,
    reproduces: method,
    exact: true,
    estimate: (params, modulus, strainLimit) =>
      family.evaluate({ params, material: { id: null, name: '', modulus, strainLimit }, method }).metrics,
  }
}
