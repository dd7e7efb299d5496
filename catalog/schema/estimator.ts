/**
 * Building blocks of a family's fast estimator (the `search` section of defineFamily): the slot
 * layout of its raw-number form and the record form derived from it. A family folder's
 * search.ts uses them; search, the design map and the tests find the estimator through the
 * registry (family.search.estimator).
 */
import type { Estimate, EstimateFn, EstimateLayout, FastEstimator, FillFn } from './types'

/** `'empties with the walls'` marks a metric that may be null at one wall thickness and not at another. */
export function layoutOf(spec: Array<[key: string, modulusPower: 0 | 1 | 'boolean', empties?: 'empties with the walls']>): EstimateLayout {
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
  return (params, modulus, strainLimit, bending) => {
    if (!fill(params, modulus, strainLimit, scratch, bending)) throw new RangeError(outside)
    const out: Estimate = {}
    for (let i = 0; i < layout.keys.length; i++) {
      const v = scratch[i]
      out[layout.keys[i]] = layout.booleans[i] ? v === 1 : Number.isNaN(v) ? null : v
    }
    return out
  }
}

/** A dedicated estimator from its raw-number fill; `outside` is the message where the fill does not apply. */
export function dedicatedEstimator(method: string, reproduces: string, exact: boolean, layout: EstimateLayout, fill: FillFn, outside = 'outside the fast estimate\u2019s range', monotoneIn: readonly string[] = [], extremesAtEnds = false): FastEstimator {
  return Object.freeze({ method, reproduces, exact, layout, fill, estimate: recordOf(layout, fill, outside), monotoneIn: Object.freeze([...monotoneIn]), extremesAtEnds })
}
