/**
 * The engineering core's one entrance, used by the API, the CLI, the web app and scripts.
 * Pure: no I/O, deterministic for the same input.
 */
import { families } from './families'
import { SolverError, ValidationError } from './errors'
import { validateParams, type ValidateOptions } from './schema/validate'
import type { Evaluation, FamilyDefinition, MetricValue } from './schema/types'

export { families }
export * from './schema'
export * from './errors'
export { builtinMaterials, findBuiltinMaterial } from './materials'
export type { Material } from './materials'
export { nearlyEqual, roundTo } from './numeric'

export class UnknownFamilyError extends Error {
  readonly familyId: string
  constructor(familyId: string) {
    super(`unknown module family "${familyId}"; known: ${families.map((f) => f.id).join(', ')}`)
    this.name = 'UnknownFamilyError'
    this.familyId = familyId
  }
}

export function getFamily(familyId: string): FamilyDefinition {
  const family = families.find((f) => f.id === familyId)
  if (!family) throw new UnknownFamilyError(familyId)
  return family
}

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

export { serializeStl } from './geometry/stl'

// Search and the configure screen's checks (force window, tolerance band, printability).
export { searchShelf, searchShelfSync, SearchCancelledError, createShelfIndex, DEMO_SHELF, windowCacheKey } from './search'
export type { Shelf, ShelfEntry, SearchOptions, SearchProgress, SearchResult, SearchAnswer, SearchMaterial } from './search'
export { parseWindow, judge, judgeWithBand } from './window'
export type { ForceWindow, Judgement, MetricBand, PrinterProfile, ManufacturingTolerance } from './window'
export { toleranceBand, DEFAULT_TOLERANCE, DEFAULT_TOLERANCE_NOTE } from './tolerance'
export type { ToleranceBand } from './tolerance'
export { checkPrintability, DEFAULT_PRINTER, printerRules } from './printability'
export type { PrintabilityReport, PrintCheck, ParamFix } from './printability'

// Measured curves against predictions: fitted effective modulus, feature differences, calibration figures.
export { fitModulus, compareToPrediction, calibrationSummary } from './calibration'
export type { ModulusFit, CurveComparison, FeatureDifference, CalibrationGroup, SampledCurve } from './calibration'
