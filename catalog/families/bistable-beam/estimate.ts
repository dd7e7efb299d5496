/**
 * Fast estimate of the bistable pair's metrics from the precomputed table (for search):
 * ≥ 10⁶ evaluations per second, within the interpolation error the table reports
 * (bistableTableTolerance(), measured by the generator on held-out direct solves).
 */
import type { MetricValue } from '../../schema/types'
import { estimateFromTable } from './table'
import { bistableTable } from './table-store'
import { ERROR_METRICS, type ErrorQuantiles } from './table-build'

export type BistableToleranceMetric = (typeof ERROR_METRICS)[number]

let tolerance: Readonly<Record<BistableToleranceMetric, number>> | null = null

/**
 * The table's error against the nonlinear-fe method, per metric, as a fraction of the metric
 * itself: the largest error over the generator's held-out sample of bistable parts inside the
 * family's ranges whose estimate is not marked uncertain (uncertainty.ts). Search widens each estimated metric's band by this much of its
 * norm before comparing with a window, and accepts an exact-solver confirmation as agreeing
 * when it is within it. Read from the table on first use.
 */
export function bistableTableTolerance(): Readonly<Record<BistableToleranceMetric, number>> {
  tolerance ??= Object.freeze(
    Object.fromEntries(ERROR_METRICS.map((k) => [k, bistableTable().validation.bistable[k].max])) as Record<BistableToleranceMetric, number>,
  )
  return tolerance
}

/** The full error statistics (median, 90th and 99th percentile, max) behind the tolerance. */
export function bistableTableError(): Readonly<Record<string, ErrorQuantiles>> {
  return bistableTable().validation.bistable
}

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
  return estimateFromTable(bistableTable(), p, material)
}
