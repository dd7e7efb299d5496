/**
 * The bistable switch's tolerance rules. Its fast estimate is interpolated from the precomputed
 * table, so search and the configure check allow it to lie from the exact solver by the table's
 * measured interpolation error: bistableTableTolerance(), a fraction of each metric's norm
 * (ERROR_NORMS), times that norm taken from the exact answer, in the metric's own units.
 */
import type { MetricValue } from '../../schema/types'
import { bistableTableTolerance } from './estimate'
import { ERROR_NORMS } from './table-build'

export function estimateAllowance(exact: Readonly<Record<string, MetricValue>>, params: Readonly<Record<string, number | string>>): Record<string, number> {
  const norms: Record<string, number | null> = {
    peakForce: typeof exact.peakForce === 'number' ? Math.abs(exact.peakForce) : null,
    apexHeight: typeof params.apexHeight === 'number' ? params.apexHeight : null,
    energyIn: typeof exact.energyIn === 'number' ? Math.abs(exact.energyIn) : null,
    maxStrain: typeof exact.maxStrain === 'number' ? Math.abs(exact.maxStrain) : null,
  }
  const allowance: Record<string, number> = {}
  for (const [metric, normKey] of Object.entries(ERROR_NORMS)) {
    const norm = norms[normKey]
    if (norm !== null) allowance[metric] = bistableTableTolerance()[metric as keyof ReturnType<typeof bistableTableTolerance>] * norm
  }
  return allowance
}
