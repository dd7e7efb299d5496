/**
 * Fast estimate of the bistable pair's metrics from the precomputed table (for search):
 * ≥ 10⁶ evaluations per second, within the interpolation error the table reports
 * (BISTABLE_TABLE_TOLERANCE, measured by the generator on held-out direct solves).
 */
import type { MetricValue } from '../../schema/types'
import { estimateFromTable } from './table'
import { TABLE } from './table-data'
import { ERROR_NORMS, type ErrorQuantiles } from './table-build'

export type BistableToleranceMetric = keyof typeof ERROR_NORMS

/**
 * The table's error against the nonlinear-fe method, per metric, as a fraction of the metric's
 * norm (ERROR_NORMS: forces of the peak force, positions of the apex height, energies of the
 * work to snap, strain of itself): the largest error over the generator's held-out sample of
 * bistable parts inside the family's ranges. Search should widen each estimated metric's band
 * by this much of its norm before comparing with a window, and accept an exact-solver
 * confirmation as agreeing when it is within it.
 */
export const BISTABLE_TABLE_TOLERANCE: Readonly<Record<BistableToleranceMetric, number>> = Object.freeze(
  Object.fromEntries(Object.keys(ERROR_NORMS).map((k) => [k, TABLE.validation.bistable[k].max])) as Record<BistableToleranceMetric, number>,
)

/** The full error statistics (median, 90th and 99th percentile, max) behind the tolerance. */
export const BISTABLE_TABLE_ERROR: Readonly<Record<string, ErrorQuantiles>> = TABLE.validation.bistable

/**
 * The bistable flag may be wrong only when |valleyForce| is below this fraction of the peak
 * force (the thin band around the bistability limit, measured on the same sample).
 */
export const BISTABLE_FLAG_BAND: number = TABLE.validation.flagBand

export interface BistableEstimateParams {
  span: number
  apexHeight: number
  thickness: number
  depth: number
  postLength: number
}

/**
 * Metrics with the same keys and units as the nonlinear-fe evaluation, or null when the
 * parameters fall outside the table. `material` gives modulus (MPa) and strainLimit.
 */
export function estimateBistable(p: BistableEstimateParams, material: { modulus: number; strainLimit: number }): Record<string, MetricValue> | null {
  return estimateFromTable(TABLE, p, material)
}

/** Peak force the same beams would give with rigidly clamped ends (postLength 0), N, or null. */
export function estimateRigidPeak(p: Record<string, number>, modulus: number): number | null {
  const e = estimateBistable({ span: p.span, apexHeight: p.apexHeight, thickness: p.thickness, depth: p.depth, postLength: 0 }, { modulus, strainLimit: 1 })
  return e ? (e.peakForce as number) : null
}
