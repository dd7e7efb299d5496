import type { MetricValue } from '../schema/types'
import { BISTABLE_TABLE_TOLERANCE } from '../families/bistable-beam/estimate'
import { ERROR_NORMS } from '../families/bistable-beam/table-build'

/**
 * How far a family's fast estimate may lie from its exact method, per metric, in the metric's
 * own units: the table's measured interpolation error (BISTABLE_TABLE_TOLERANCE, a fraction of
 * each metric's norm) times that norm, taken from the exact answer. Families whose fast
 * estimate is their own closed form state no tolerance (an empty record): the two methods
 * differ by the models' own difference, which the confirmation reports as it is.
 */
export function estimateAllowance(familyId: string, exact: Record<string, MetricValue>, params: Record<string, number | string>): Record<string, number> {
  if (familyId !== 'bistable-beam') return {}
  const norms: Record<string, number | null> = {
    peakForce: typeof exact.peakForce === 'number' ? Math.abs(exact.peakForce) : null,
    apexHeight: typeof params.apexHeight === 'number' ? params.apexHeight : null,
    energyIn: typeof exact.energyIn === 'number' ? Math.abs(exact.energyIn) : null,
    maxStrain: typeof exact.maxStrain === 'number' ? Math.abs(exact.maxStrain) : null,
  }
  const allowance: Record<string, number> = {}
  for (const [metric, normKey] of Object.entries(ERROR_NORMS)) {
    const norm = norms[normKey]
    if (norm !== null) allowance[metric] = BISTABLE_TABLE_TOLERANCE[metric as keyof typeof BISTABLE_TABLE_TOLERANCE] * norm
  }
  return allowance
}
