/** Search's fast estimate of the leaf hinge (a test holds it to the family's model). */
import { LRUCache } from 'lru-cache'
import { bendingModulus, type BendingMaterial } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { evaluate as leafHingeModel } from './model'

/**
 * The leaf hinge's metrics come from a root search in its model. Moment scales with E·b and
 * every other metric (rotation, drift, strain) is geometric, independent of the modulus and the
 * depth; so the family's own model is run once per (length, thickness, linkLength, strain
 * limit) at a reference modulus and unit depth, memoised, and the stiffness scaled by E·b.
 * A test holds this to the model.
 */
const LEAF_MEMO_LIMIT = 50000
const LEAF_REFERENCE_MODULUS = 1000
/**
 * Per memo key: rotationalStiffness at the reference modulus and unit depth, maxRotation,
 * pivotDrift, maxStrain, safetyFactor. Least recently used keys go first, so a long search
 * keeps the keys of the entry it is on.
 */
const leafMemo = new LRUCache<string, Float64Array>({ max: LEAF_MEMO_LIMIT })
const LEAF_LAYOUT = layoutOf([['rotationalStiffness', 1], ['maxRotation', 0], ['pivotDrift', 0], ['maxStrain', 0], ['safetyFactor', 0]])
function leafHingeFill(p: Record<string, number>, modulus: number, limit: number, out: Float64Array, bending: BendingMaterial): boolean {
  const E = bendingModulus(modulus, bending, p.depth, p.thickness) // the model's wide-beam rule
  const key = `${p.length}|${p.thickness}|${p.linkLength}|${limit}`
  let unit = leafMemo.get(key)
  if (!unit) {
    const m = leafHingeModel({ params: { ...p, depth: 1 }, material: { id: null, name: '', modulus: LEAF_REFERENCE_MODULUS, strainLimit: limit, poissonRatio: 0 }, method: 'prbm', wideBeam: 'off' }).metrics
    unit = Float64Array.from(LEAF_LAYOUT.keys, (k) => (typeof m[k] === 'number' ? (m[k] as number) : NaN))
    leafMemo.set(key, unit)
  }
  out[0] = (unit[0] * E * p.depth) / LEAF_REFERENCE_MODULUS
  out[1] = unit[1]
  out[2] = unit[2]
  out[3] = unit[3]
  out[4] = unit[4]
  return true
}

// stiffness ∝ depth, the rest independent of it (see above)
export const estimator = dedicatedEstimator('prbm', 'prbm', true, LEAF_LAYOUT, leafHingeFill, undefined, ['depth'])
