/**
 * The tolerance band of a configuration: the family's own evaluate at the nominal point and
 * at every manufacturing-tolerance corner (no estimator here, so the band is exact with
 * respect to the method asked for), the curves' envelope on the nominal displacement grid,
 * and each numeric metric's [low, high] over nominal and corners.
 */
import { evaluateFamily, type EvaluateOptions } from '../evaluate'
import { getFamily } from '../registry'
import { SolverError, ValidationError } from '../errors'
import type { Evaluation, FamilyDefinition, MetricValue } from '../schema/types'
import type { ManufacturingTolerance } from '../window/schema'
import type { MetricBand } from '../window/judge'
import { toleranceCorners } from './corners'
import { curveBand, type CurveBand } from './curve-band'
import { resolveTolerance } from './defaults'

export interface ToleranceOptions extends EvaluateOptions {
  /** ± wall thickness (mm) and ± modulus fraction; defaults to DEFAULT_TOLERANCE. */
  tolerance?: Partial<ManufacturingTolerance>
}

interface CornerEvaluation {
  /** −1 / 0 / +1: walls thinner, as given, thicker. */
  thickness: -1 | 0 | 1
  /** −1 / 0 / +1: modulus lower, as given, higher. */
  modulus: -1 | 0 | 1
  params: Record<string, number | string>
  evaluation: Evaluation
}

export interface ToleranceBand {
  tolerance: ManufacturingTolerance
  nominal: Evaluation
  corners: CornerEvaluation[]
  curve: CurveBand
  /** [low, high] per numeric metric over nominal and corners; null when one of them has no value. */
  metrics: MetricBand
  /** Clamped corners and corners the model could not evaluate. */
  warnings: string[]
  /** False when a corner could not be evaluated (then the band covers fewer corners than asked). */
  complete: boolean
}

function metricBand(evaluations: Array<Record<string, MetricValue>>): MetricBand {
  const band: MetricBand = {}
  for (const key of Object.keys(evaluations[0] ?? {})) {
    const values = evaluations.map((m) => m[key])
    if (values.every((v) => typeof v === 'boolean')) continue
    if (values.some((v) => typeof v !== 'number')) { band[key] = null; continue }
    const nums = values as number[]
    band[key] = [Math.min(...nums), Math.max(...nums)]
  }
  return band
}

export function toleranceBand(family: FamilyDefinition | string, rawParams: unknown, options: ToleranceOptions = {}): ToleranceBand {
  const def = typeof family === 'string' ? getFamily(family) : family
  const tolerance = resolveTolerance(options.tolerance)
  const nominal = evaluateFamily(def, rawParams, options)
  const numeric: Record<string, number> = {}
  for (const spec of def.params) numeric[spec.key] = nominal.params[spec.key] as number

  const warnings: string[] = []
  let complete = true
  const corners: CornerEvaluation[] = []
  const cornerOptions: EvaluateOptions = { method: nominal.method, materials: options.materials }
  for (const corner of toleranceCorners(def, numeric, nominal.material.modulus, tolerance, warnings)) {
    if (corner.thickness === 0 && corner.modulus === 0) continue
    // Corners may leave the entry's allowed ranges (the part is printed off-size), not the model's.
    const params: Record<string, number | string> = { ...corner.params, modulus: corner.modulusValue, strainLimit: nominal.material.strainLimit }
    if (nominal.material.id) params.material = nominal.material.id
    // the corners bend as the nominal part does: its Poisson's ratio and wide-beam mode
    if (def.bendsBeams) {
      params.poissonRatio = nominal.material.poissonRatio
      if (typeof nominal.params.wideBeam === 'string') params.wideBeam = nominal.params.wideBeam
    }
    try {
      corners.push({ thickness: corner.thickness, modulus: corner.modulus, params, evaluation: evaluateFamily(def, params, cornerOptions) })
    } catch (e) {
      if (!(e instanceof ValidationError || e instanceof SolverError)) throw e
      complete = false
      const which = `walls ${['thinner', 'as given', 'thicker'][corner.thickness + 1]}, modulus ${['lower', 'as given', 'higher'][corner.modulus + 1]}`
      warnings.push(`tolerance corner (${which}) could not be evaluated: ${e.message}`)
    }
  }
  const all = [nominal, ...corners.map((c) => c.evaluation)]
  return {
    tolerance,
    nominal,
    corners,
    curve: curveBand(nominal.curve, corners.map((c) => c.evaluation.curve)),
    metrics: metricBand(all.map((e) => e.metrics)),
    warnings,
    complete,
  }
}
