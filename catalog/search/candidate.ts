/**
 * One candidate parameter set judged with the fast estimator over the manufacturing
 * tolerance band: nominal first (a band contains its nominal point, so a nominal outside the
 * window rules the candidate out at once), then the four corners (walls ± dt together,
 * modulus × (1 ± f)), clamped to the model's ranges as catalog/tolerance does.
 */
import { MODULUS_RANGE } from '../tolerance'
import type { FamilyDefinition, MetricValue } from '../schema/types'
import { scoreBand, type CompiledWindow } from '../window'
import type { ForceWindow, ManufacturingTolerance } from '../window/schema'
import type { Estimate, FastEstimator } from './estimators'

export interface CandidateContext {
  family: FamilyDefinition
  estimator: FastEstimator
  modulus: number
  strainLimit: number
  tolerance: ManufacturingTolerance
  compiled: CompiledWindow
  footprint: ForceWindow['footprint']
  walls: Array<{ key: string; min: number; max: number }>
}

export interface CandidateScore {
  /** Inside the window over the whole band, under the strain limit, inside the footprint. */
  ok: boolean
  /** What ruled it out: a bound id (`peakForce.max`), 'bistable', 'strain', 'footprint.length', 'rules', 'model'. */
  reason: string | null
  /** Smallest window margin over the band (nominal only when the nominal already failed). */
  windowMargin: number
  /** Worst safety factor − 1, or null when the family reports none. */
  strainMargin: number | null
  footprintMargin: number | null
  /** min of the three margins: what refinement climbs and "nearest" measures. */
  objective: number
  nominal: Estimate | null
  low: Record<string, MetricValue> | null
  high: Record<string, MetricValue> | null
  /** Whether the band (corners) was evaluated, or only the nominal point. */
  banded: boolean
}

/** Fraction of the footprint left in the better quarter-turn, or null without a footprint. */
export function footprintMargin(footprint: ForceWindow['footprint'], x: number, y: number): number | null {
  if (!footprint || (footprint.length === undefined && footprint.width === undefined)) return null
  const fit = (along: number, across: number) => Math.min(
    footprint.length === undefined ? Infinity : (footprint.length - along) / footprint.length,
    footprint.width === undefined ? Infinity : (footprint.width - across) / footprint.width,
  )
  return Math.max(fit(x, y), fit(y, x))
}

function fold(keys: string[], into: { low: Record<string, MetricValue>; high: Record<string, MetricValue> }, e: Estimate): void {
  for (const k of keys) {
    const v = e[k]
    const lo = into.low[k]
    if (typeof v === 'number' && typeof lo === 'number') {
      if (v < lo) into.low[k] = v
      if (v > (into.high[k] as number)) into.high[k] = v
    } else if (typeof v === 'boolean' && typeof lo === 'boolean') {
      into.low[k] = lo && v
      into.high[k] = (into.high[k] as boolean) || v
    } else if (v !== lo || v !== into.high[k]) {
      into.low[k] = null
      into.high[k] = null
    }
  }
}

function rejected(reason: string, objective: number, footprint: number | null): CandidateScore {
  return { ok: false, reason, windowMargin: objective, strainMargin: null, footprintMargin: footprint, objective, nominal: null, low: null, high: null, banded: false }
}

function judged(ctx: CandidateContext, nominal: Estimate, low: Record<string, MetricValue>, high: Record<string, MetricValue>, fpMargin: number | null, banded: boolean): CandidateScore {
  const score = scoreBand(ctx.compiled, low, high)
  const sf = low.safetyFactor
  const strainMargin = typeof sf === 'number' ? sf - 1 : null
  // Strain-governed families report exactly 1 at their largest travel: allow for rounding.
  const strainOk = strainMargin === null || strainMargin >= -1e-9
  const windowOk = score.margin >= 0
  let objective = score.margin
  if (strainMargin !== null && !strainOk && strainMargin < objective) objective = strainMargin
  if (fpMargin !== null && fpMargin < objective) objective = fpMargin
  const reason = !windowOk ? (score.binding === -2 ? 'bistable' : ctx.compiled.bounds[score.binding].id) : !strainOk ? 'strain' : null
  return { ok: windowOk && strainOk, reason, windowMargin: score.margin, strainMargin, footprintMargin: fpMargin, objective, nominal, low, high, banded }
}

export function scoreCandidate(ctx: CandidateContext, params: Record<string, number>, keys: string[]): CandidateScore {
  const rules = ctx.family.rules
  for (let i = 0; i < rules.length; i++) if (rules[i].check(params)) return rejected('rules', -Infinity, null)
  let fpMargin: number | null = null
  if (ctx.footprint) {
    const env = ctx.family.envelope(params)
    fpMargin = footprintMargin(ctx.footprint, env.x, env.y)
    if (fpMargin !== null && fpMargin < 0) return rejected(footprintReason(ctx.footprint, env), fpMargin, fpMargin)
  }
  let nominal: Estimate
  try {
    nominal = ctx.estimator.estimate(params, ctx.modulus, ctx.strainLimit)
  } catch {
    return rejected('model', -Infinity, fpMargin)
  }
  // The band contains its nominal point: a nominal outside the window settles it.
  const first = judged(ctx, nominal, nominal, nominal, fpMargin, false)
  if (!first.ok) return first

  const band = { low: { ...nominal }, high: { ...nominal } }
  const { thickness: dt, modulus: dE } = ctx.tolerance
  const tSigns = dt > 0 && ctx.walls.length ? SIGNS : ZERO
  const eSigns = dE > 0 ? SIGNS : ZERO
  for (const ts of tSigns) {
    let shifted = params
    if (ts !== 0) {
      shifted = { ...params }
      for (const w of ctx.walls) shifted[w.key] = Math.min(w.max, Math.max(w.min, params[w.key] + ts * dt))
    }
    for (const es of eSigns) {
      if (ts === 0 && es === 0) continue
      const E = Math.min(MODULUS_RANGE[1], Math.max(MODULUS_RANGE[0], ctx.modulus * (1 + es * dE)))
      try {
        fold(keys, band, ctx.estimator.estimate(shifted, E, ctx.strainLimit))
      } catch {
        return rejected('model', -Infinity, fpMargin)
      }
    }
  }
  return judged(ctx, nominal, band.low, band.high, fpMargin, true)
}

const SIGNS = [-1, 1] as const
const ZERO = [0] as const

function footprintReason(footprint: ForceWindow['footprint'], env: { x: number; y: number }): string {
  if (!footprint || footprint.length === undefined) return 'footprint.width'
  if (footprint.width === undefined) return 'footprint.length'
  return Math.max(env.x, env.y) > footprint.length ? 'footprint.length' : 'footprint.width'
}
