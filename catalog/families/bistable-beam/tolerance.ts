/**
 * The bistable switch's tolerance rules. Its fast estimate is interpolated from the precomputed
 * table, so search and the configure check allow it to lie from the exact solver by the table's
 * measured interpolation error: bistableTableTolerance(), a fraction of each metric itself,
 * times the exact answer's value, in the metric's own units. (Estimates the table marks
 * uncertain are judged exactly by search instead: uncertainty.ts.)
 */
import type { MetricValue } from '../../schema/types'
import { bistableTableTolerance } from './estimate'
import { ERROR_METRICS } from './table-build'

export function estimateAllowance(exact: Readonly<Record<string, MetricValue>>, _params: Readonly<Record<string, number | string>>): Record<string, number> {
  const tolerance = bistableTableTolerance()
  const allowance: Record<string, number> = {}
  for (const metric of ERROR_METRICS) {
    const v = exact[metric]
    if (typeof v === 'number' && Number.isFinite(v)) allowance[metric] = tolerance[metric] * Math.abs(v)
  }
  return allowance
}
