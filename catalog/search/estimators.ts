/**
 * Fast estimators for search: the family's cheap method reduced to the metrics, so that
 * hundreds of thousands of candidates can be judged per second. A family without a dedicated
 * estimator is estimated by its own fast method through its model (exact with respect to that
 * method, only slower). Dedicated ones call the family's exported formulas, and a test checks
 * each against the family's evaluate.
 */
import { families } from '../registry'
import type { FamilyDefinition } from '../schema/types'

// The estimator's shape is part of the family contract (a family folder may carry one).
import type { FastEstimator } from '../schema/types'
export type { Estimate, EstimateLayout, FastEstimator, FillFn } from '../schema/types'

/** Built-in family id → its folder's dedicated estimator (registered families: dedicatedEstimatorFor). */
export const dedicatedEstimators: Readonly<Record<string, FastEstimator>> = Object.freeze(
  Object.fromEntries(families.filter((f) => f.search).map((f) => [f.id, f.search!.estimator])),
)

const EXACT_METHOD = 'nonlinear-fe'

/** The cheap method of a family: the first that is not the nonlinear solver. */
function fastMethodOf(family: FamilyDefinition): string {
  return (family.methods.find((m) => m.id !== EXACT_METHOD) ?? family.methods[0]).id
}

/** The method used to confirm results: the nonlinear solver when the family has it. */
export function exactMethodOf(family: FamilyDefinition): string {
  return family.methods.some((m) => m.id === EXACT_METHOD) ? EXACT_METHOD : family.defaultMethod
}

/** The family's dedicated estimator (its folder's, through the registry), or null when it has none or not for a method it offers. */
export function dedicatedEstimatorFor(family: Pick<FamilyDefinition, 'methods' | 'search'>): FastEstimator | null {
  const dedicated = family.search?.estimator
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
    estimate: (params, modulus, strainLimit, bending) =>
      family.evaluate({ params, material: { id: null, name: '', modulus, strainLimit, poissonRatio: bending.poissonRatio }, method, wideBeam: family.bendsBeams ? bending.wideBeam : 'off' }).metrics,
  }
}
