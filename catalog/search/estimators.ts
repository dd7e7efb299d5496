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

// The estimator's shape is part of the family contract (a family folder may carry one).
import type { Estimate, EstimateFn, EstimateLayout, FastEstimator, FillFn } from '../schema/types'
export type { Estimate, EstimateFn, EstimateLayout, FastEstimator, FillFn } from '../schema/types'

const DEG = 180 / Math.PI

/** `'empties with the walls'` marks a metric that may be null at one wall thickness and not at another. */
function layoutOf(spec: Array<[key: string, modulusPower: 0 | 1 | 'boolean', empties?: 'empties with the walls']>): EstimateLayout {
  return Object.freeze({
    keys: Object.freeze(spec.map(([k]) => k)),
    modulusPower: Object.freeze(spec.map(([, p]) => (p === 1 ? 1 : 0) as 0 | 1)),
    booleans: Object.freeze(spec.map(([, p]) => p === 'boolean')),
    emptyFixed: Object.freeze(spec.map(([, , e]) => e === undefined)),
  })
}

/** The record form of a fill, in the layout's key order (one scratch buffer per estimator). */
function recordOf(layout: EstimateLayout, fill: FillFn, outside: string): EstimateFn {
  const scratch = new Float64Array(layout.keys.length)
  return (params, modulus, strainLimit) => {
    if (!fill(params, modulus, strainLimit, scratch)) throw new RangeError(outside)
    const out: Estimate = {}
    for (let i = 0; i < layout.keys.length; i++) {
      const v = scratch[i]
      out[layout.keys[i]] = layout.booleans[i] ? v === 1 : Number.isNaN(v) ? null : v
    }
    return out
  }
}

function dedicated(method: string, reproduces: string, exact: boolean, layout: EstimateLayout, fill: FillFn, outside = 'outside the fast estimate\u2019s range'): FastEstimator {
  return Object.freeze({ method, reproduces, exact, layout, fill, estimate: recordOf(layout, fill, outside) })
}

/**
 * The leaf hinge's metrics come from a root search in its model. Moment scales with E·b and
 * every other metric (rotation, drift, strain) is geometric, independent of the modulus and the
 * depth; so the family's own model is run once per (length, thickness, linkLength, strain
 * limit) at a reference modulus and unit depth, memoised, and the stiffness scaled by E·b.
 * A test holds this to the model.
 */
const LEAF_MEMO_LIMIT = 50000
const LEAF_REFERENCE_MODULUS = 1000
/** Per memo key: rotationalStiffness at the reference modulus and unit depth, maxRotation, pivotDrift, maxStrain, safetyFactor. */
const leafMemo = new Map<string, Float64Array>()
const LEAF_LAYOUT = layoutOf([['rotationalStiffness', 1], ['maxRotation', 0], ['pivotDrift', 0], ['maxStrain', 0], ['safetyFactor', 0]])
function leafHingeFill(p: Record<string, number>, E: number, limit: number, out: Float64Array): boolean {
  const key = `${p.length}|${p.thickness}|${p.linkLength}|${limit}`
  let unit = leafMemo.get(key)
  if (!unit) {
    const m = leafHingeModel({ params: { ...p, depth: 1 }, material: { id: null, name: '', modulus: LEAF_REFERENCE_MODULUS, strainLimit: limit }, method: 'prbm' }).metrics
    unit = Float64Array.from(LEAF_LAYOUT.keys, (k) => (typeof m[k] === 'number' ? (m[k] as number) : NaN))
    if (leafMemo.size >= LEAF_MEMO_LIMIT) leafMemo.clear()
    leafMemo.set(key, unit)
  }
  out[0] = (unit[0] * E * p.depth) / LEAF_REFERENCE_MODULUS
  out[1] = unit[1]
  out[2] = unit[2]
  out[3] = unit[3]
  out[4] = unit[4]
  return true
}

const BISTABLE_LAYOUT = layoutOf([
  ['peakForce', 1], ['valleyForce', 1], ['unstablePosition', 0, 'empties with the walls'], ['secondStablePosition', 0, 'empties with the walls'],
  ['energyIn', 1, 'empties with the walls'], ['energyBarrier', 1, 'empties with the walls'],
  ['bistable', 'boolean'], ['maxStrain', 0], ['strainLimit', 0], ['safetyFactor', 0],
])
const bistableGeometry = { span: 0, apexHeight: 0, thickness: 0, depth: 0, postLength: 0 }
const bistableMaterial = { modulus: 0, strainLimit: 0 }
function bistableFill(p: Record<string, number>, E: number, limit: number, out: Float64Array): boolean {
  bistableGeometry.span = p.span
  bistableGeometry.apexHeight = p.apexHeight
  bistableGeometry.thickness = p.thickness
  bistableGeometry.depth = p.depth
  bistableGeometry.postLength = p.postLength
  bistableMaterial.modulus = E
  bistableMaterial.strainLimit = limit
  const e = estimateBistable(bistableGeometry, bistableMaterial)
  if (!e) return false
  // named reads in BISTABLE_LAYOUT's order (a keyed loop over the record is slower)
  out[0] = slotValue(e.peakForce)
  out[1] = slotValue(e.valleyForce)
  out[2] = slotValue(e.unstablePosition)
  out[3] = slotValue(e.secondStablePosition)
  out[4] = slotValue(e.energyIn)
  out[5] = slotValue(e.energyBarrier)
  out[6] = slotValue(e.bistable)
  out[7] = slotValue(e.maxStrain)
  out[8] = slotValue(e.strainLimit)
  out[9] = slotValue(e.safetyFactor)
  return true
}

function slotValue(v: MetricValue | undefined): number {
  return typeof v === 'number' ? v : typeof v === 'boolean' ? (v ? 1 : 0) : NaN
}

const nanIfNull = (v: number | null) => (v === null ? NaN : v)

/** Family id → dedicated estimator. Each reproduces the named method's metrics. */
export const dedicatedEstimators: Readonly<Record<string, FastEstimator>> = Object.freeze({
  'parallel-guide': dedicated('linear', 'linear', true,
    layoutOf([['stiffness', 1], ['maxTravel', 0], ['parasiticMotion', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
    (p, E, limit, out) => {
      const range = linearTravelRange(p, limit)
      const strain = linearStrain(p, range.maxTravel)
      out[0] = linearStiffness(p, E)
      out[1] = range.maxTravel
      out[2] = parasiticShortening(p.length, range.maxTravel)
      out[3] = strain
      out[4] = limit / strain
      return true
    }),
  'serpentine-spring': dedicated('castigliano', 'castigliano', true,
    layoutOf([['stiffness', 1], ['maxTravel', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
    (p, E, limit, out) => {
      const k = castiglianoStiffness(p.spans, p.spanLength, p.pitch, (E * p.depth * p.thickness ** 3) / 12)
      // strain per mm of travel: at the force k·1 mm, and k ∝ E, so E cancels
      const perMm = linearStrainAtForce(p, E, k)
      const maxTravel = Math.min(limit / perMm, travelCap(p))
      out[0] = k
      out[1] = maxTravel
      out[2] = perMm * maxTravel
      out[3] = limit / (perMm * maxTravel)
      return true
    }),
  'notch-hinge': dedicated('paros-weisbord', 'paros-weisbord', true,
    layoutOf([['rotationalStiffness', 1], ['maxRotation', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
    (p, E, limit, out) => {
      // compliance ∝ 1/E and the limit moment ∝ E: the rotation range and the strain do not depend on E
      const compliance = parosWeisbordCompliance(E, p.depth, p.radius, p.neckThickness)
      const range = rotationRange(compliance, E, p.depth, p.neckThickness, limit)
      const strain = neckStrain(range.maxRotation / compliance, E, p.depth, p.neckThickness)
      out[0] = 1 / compliance
      out[1] = range.maxRotation * DEG
      out[2] = strain
      out[3] = limit / strain
      return true
    }),
  'snap-hook': dedicated('snap-fit-equations', 'snap-fit-equations', true,
    layoutOf([['deflectionForce', 1], ['matingForce', 1], ['separationForce', 1], ['rootStrain', 0], ['strainLimit', 0], ['safetyFactor', 0]]),
    (p, E, limit, out) => {
      // the root strain is taken at the undercut (a displacement), so it does not depend on E
      const ratio = p.tipThickness / p.rootThickness
      const P = deflectionForce(E, p.width, p.rootThickness, p.length, p.undercut, ratio)
      const strain = rootStrainAt(p.undercut, p.length, p.rootThickness, ratio)
      out[0] = P
      out[1] = nanIfNull(wedgeForce(P, p.friction, p.entryAngle))
      out[2] = nanIfNull(wedgeForce(P, p.friction, p.retainAngle))
      out[3] = strain
      out[4] = limit
      out[5] = limit / strain
      return true
    }),
  'bistable-beam': dedicated('table', 'nonlinear-fe', false, BISTABLE_LAYOUT, bistableFill, 'outside the precomputed bistable table'),
  'leaf-hinge': dedicated('prbm', 'prbm', true, LEAF_LAYOUT, leafHingeFill),
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

/** The family's dedicated estimator, or null when it has none (or not for a method it offers). */
export function dedicatedEstimatorFor(family: Pick<FamilyDefinition, 'id' | 'methods'>): FastEstimator | null {
  const dedicated = dedicatedEstimators[family.id]
  return dedicated && family.methods.some((m) => m.id === dedicated.reproduces) ? dedicated : null
}

export function estimatorFor(family: FamilyDefinition): FastEstimator {
  const dedicated = dedicatedEstimatorFor(family)
  if (dedicated) return dedicated
  const method = fastMethodOf(family)
  return {
    method,
    reproduces: method,
    exact: true,
    estimate: (params, modulus, strainLimit) =>
      family.evaluate({ params, material: { id: null, name: '', modulus, strainLimit }, method }).metrics,
  }
}
