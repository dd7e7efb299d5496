import type { FamilyDefinition, MetricValue } from '../schema/types'
import { findFamily } from '../registry'

/**
 * How far a family's fast estimate may lie from its exact method, per metric, in the metric's
 * own units: the family's own tolerance rule (its folder's `tolerance.estimateAllowance`; a
 * family given by id is found through the registry). Families whose fast estimate is their own
 * closed form state no tolerance (an empty record): the two methods differ by the models' own
 * difference, which the confirmation reports as it is.
 */
export function estimateAllowance(family: string | Pick<FamilyDefinition, 'tolerance'>, exact: Record<string, MetricValue>, params: Record<string, number | string>): Record<string, number> {
  const def = typeof family === 'string' ? findFamily(family) : family
  return def?.tolerance?.estimateAllowance?.(exact, params) ?? {}
}
