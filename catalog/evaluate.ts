/**
 * evaluate: validates a family's parameters, runs its model and checks that every number it
 * returns is finite. Pure: no I/O, deterministic for the same input.
 */
import { LRUCache } from 'lru-cache'
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
  const { params, material, wideBeam, echo } = validateParams(family, rawParams, options)
  const out = family.evaluate({ params, material, method, wideBeam })
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
    ...(out.bending ? { bending: out.bending } : {}),
  }
}

/**
 * Solids built lately, by family and validated parameters: a part's STL, 3MF, DXF and SVG,
 * and the next request for the same part, share one build (JSCAD solids are immutable: every
 * operation returns a new one). A few dozen parts of a few hundred kilobytes each.
 */
const SOLID_CACHE_SIZE = 32
const solids = new LRUCache<string, { family: FamilyDefinition; solid: unknown }>({ max: SOLID_CACHE_SIZE })

/** The parameters in the family's own order, so that the same part gives the same key. */
function solidKey(family: FamilyDefinition, params: Record<string, number>): string {
  return `${family.id}|${family.params.map((p) => params[p.key]).join('|')}`
}

/**
 * The family's closed JSCAD solid (geom3) in mm for validated parameters; the one place a
 * solid is built (cached, see SOLID_CACHE_SIZE).
 */
export function buildGeometry(familyId: string, rawParams: unknown): unknown {
  const family = getFamily(familyId)
  const { params } = validateParams(family, rawParams)
  const key = solidKey(family, params)
  const held = solids.get(key)
  // a family registered again under the same id builds its own solid
  if (held && held.family === family) return held.solid
  const solid = family.build(params)
  solids.set(key, { family, solid })
  return solid
}

/** Empties the solid cache (benchmarks time a build from scratch). */
export function clearSolidCache(): void {
  solids.clear()
}
