/**
 * evaluate: validates a family's parameters, runs its model and checks that every number it
 * returns is finite. Pure: no I/O, deterministic for the same input.
 */
import { SolverError, ValidationError } from './errors'
import { getFamily } from './registry'
import { validateParams, type ValidateOptions } from './schema/validate'
import type { Evaluation, FamilyDefinition, MetricValue } from './schema/types'

export interface EvaluateOptions extends ValidateOptions {
  method?: string
}

function assertFinite(family: FamilyDefinition, method: string, values: number[], what: string) {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new SolverError(`${family.id} (${method}) produced a non-finite ${what} at point ${i}`, { what, index: i })
    }
  }
}

/** Validates the parameters, runs the family's model and checks that every number is finite. */
export function evaluate(familyId: string, rawParams: unknown, options: EvaluateOptions = {}): Evaluation {
  return evaluateFamily(getFamily(familyId), rawParams, options)
}

/** The same as evaluate, for a family definition in hand (tolerance bands, tests with a made-up family). */
export function evaluateFamily(family: FamilyDefinition, rawParams: unknown, options: EvaluateOptions = {}): Evaluation {
  const method = options.method ?? family.defaultMethod
  const methodInfo = family.methods.find((m) => m.id === method)
  if (!methodInfo) {
    throw new ValidationError([{ field: 'method', message: `unknown method "${method}" for ${family.id}; use one of ${family.methods.map((m) => m.id).join(', ')}` }])
  }
  const { params, material, echo } = validateParams(family, rawParams, options)
  const out = family.evaluate({ params, material, method })
  assertFinite(family, method, out.curve.displacement, 'displacement')
  assertFinite(family, method, out.curve.force, 'force')
  if (out.curve.strain) assertFinite(family, method, out.curve.strain, 'strain')
  const metrics: Record<string, MetricValue> = {}
  for (const [key, value] of Object.entries(out.metrics)) {
    if (typeof value === 'number' && !Number.isFinite(value)) {
      throw new SolverError(`${family.id} (${method}) produced a non-finite metric ${key}`, { metric: key })
    }
    metrics[key] = value
  }
  return {
    family: family.id,
    method,
    params: echo,
    material,
    curve: out.curve,
    metrics,
    warnings: out.warnings,
    source: `${methodInfo.label}: ${methodInfo.source}`,
  }
}

/** The family's closed JSCAD solid (geom3) in mm for validated parameters. */
export function buildGeometry(familyId: string, rawParams: unknown): unknown {
  const family = getFamily(familyId)
  const { params } = validateParams(family, rawParams)
  return family.build(params)
}
