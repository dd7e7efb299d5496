/**
 * One candidate parameter set judged with the fast estimator over the manufacturing
 * tolerance band: nominal first (a band contains its nominal point, so a nominal outside the
 * window rules the candidate out at once), then the four corners (walls ± dt together,
 * modulus × (1 ± f)), clamped to the model's ranges as catalog/tolerance does.
 *
 * Search judges millions of candidates, so `CandidateJudge` does it on raw numbers: the
 * estimator writes into a reused typed array, the window is scored on those slots, and the
 * modulus corners come from the thickness corners by scaling (every E-dependent metric of
 * the dedicated estimators is proportional to E, see EstimateLayout): three estimates per
 * candidate instead of five, and no object per candidate. The records of `CandidateScore` are
 * built only for the few candidates the engine keeps. An estimator without a raw-number form
 * is judged on records by `scoreRecords`, as before.
 */
import type { BendingMaterial } from '../mechanics/wide-beam'
import { MODULUS_RANGE } from '../tolerance/corners'
import type { FamilyDefinition, MetricValue } from '../schema/types'
import { MARGIN_LIMIT, scoreBand, sideMargin, strainBasis, strainFloor, strainHolds, type CompiledWindow } from '../window'
import type { ForceWindow, ManufacturingTolerance } from '../window/schema'
import type { Estimate, EstimateLayout, FastEstimator, FillFn } from './estimators'

/** What judging reads of a family: its rules, and its envelope when the window has a footprint. */
type JudgedFamily = Pick<FamilyDefinition, 'rules'> & Partial<Pick<FamilyDefinition, 'envelope'>>

export interface CandidateContext {
  family: JudgedFamily
  estimator: FastEstimator
  modulus: number
  strainLimit: number
  /** Poisson's ratio and wide-beam mode the estimator bends its beams with (catalog/mechanics/wide-beam.ts). */
  bending: BendingMaterial
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
function footprintMargin(footprint: ForceWindow['footprint'], x: number, y: number): number | null {
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
  // the shared strain rule (window/rule.ts): a working range ends at a factor of 1 by construction
  const strainOk = typeof sf !== 'number' || strainHolds(sf, Object.keys(nominal))
  const windowOk = score.margin >= 0
  let objective = score.margin
  if (strainMargin !== null && !strainOk && strainMargin < objective) objective = strainMargin
  if (fpMargin !== null && fpMargin < objective) objective = fpMargin
  const reason = !windowOk ? (score.binding === -2 ? 'bistable' : ctx.compiled.bounds[score.binding].id) : !strainOk ? 'strain' : null
  return { ok: windowOk && strainOk, reason, windowMargin: score.margin, strainMargin, footprintMargin: fpMargin, objective, nominal, low, high, banded }
}

/** Judged on records, every corner estimated: the path of estimators without a raw-number form. */
export function scoreRecords(ctx: CandidateContext, params: Record<string, number>, keys: string[]): CandidateScore {
  const rules = ctx.family.rules
  for (let i = 0; i < rules.length; i++) if (rules[i].check(params)) return rejected('rules', -Infinity, null)
  let fpMargin: number | null = null
  if (ctx.footprint) {
    const env = envelopeOf(ctx, params)
    fpMargin = footprintMargin(ctx.footprint, env.x, env.y)
    if (fpMargin !== null && fpMargin < 0) return rejected(footprintReason(ctx.footprint, env), fpMargin, fpMargin)
  }
  let nominal: Estimate
  try {
    nominal = ctx.estimator.estimate(params, ctx.modulus, ctx.strainLimit, ctx.bending)
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
        fold(keys, band, ctx.estimator.estimate(shifted, E, ctx.strainLimit, ctx.bending))
      } catch {
        return rejected('model', -Infinity, fpMargin)
      }
    }
  }
  return judged(ctx, nominal, band.low, band.high, fpMargin, true)
}

function envelopeOf(ctx: CandidateContext, params: Record<string, number>): { x: number; y: number; z: number } {
  if (!ctx.family.envelope) throw new Error('a window with a footprint needs the family\u2019s envelope to judge candidates')
  return ctx.family.envelope(params)
}

const SIGNS = [-1, 1] as const
/** Relative widening of a box's corner hull: room for a member's rounding beyond its corners. */
const BOX_SLACK = 1e-9
const ZERO = [0] as const

function footprintReason(footprint: ForceWindow['footprint'], env: { x: number; y: number }): string {
  if (!footprint || footprint.length === undefined) return 'footprint.width'
  if (footprint.width === undefined) return 'footprint.length'
  return Math.max(env.x, env.y) > footprint.length ? 'footprint.length' : 'footprint.width'
}

/**
 * The corners a box of n monotone parameters is bounded from, as bit masks c = 0, step, … last
 * (bit i: parameter i at its high end): every corner, or where the estimator's extremes lie at
 * the ends (FastEstimator.extremesAtEnds) the lowest and the highest alone.
 */
export function boxCorners(estimator: Pick<FastEstimator, 'extremesAtEnds'>, n: number): { last: number; step: number } {
  const last = (1 << n) - 1
  return { last, step: estimator.extremesAtEnds ? Math.max(1, last) : 1 }
}

/** Where judging stopped: the rules, the footprint, the estimate, the nominal verdict, the band. */
const Stage = { Rules: 0, Footprint: 1, Model: 2, Nominal: 3, Band: 4 } as const
type Stage = (typeof Stage)[keyof typeof Stage]

/**
 * Judges candidates of one context repeatedly. `judge(params)` leaves the verdict in the
 * public fields (ok, reason, margins, objective) and allocates nothing on the raw-number path;
 * `score(params)` returns the full CandidateScore (it judges again, so pass the same params
 * to get the score of the candidate just judged). A tolerance corner or a box corner is
 * estimated with its values set in `params` itself, which is as it was given when the call
 * returns (so a params record must be writable; none is copied per corner).
 */
export class CandidateJudge {
  ok = false
  reason: string | null = null
  windowMargin = -Infinity
  /**
   * The strain margin, NaN for none: kept as a plain number, since a field or local that holds
   * either a number or null boxes every number stored in it (a heap allocation per verdict).
   */
  strainValue = NaN
  get strainMargin(): number | null { return Number.isNaN(this.strainValue) ? null : this.strainValue }
  footprintMargin: number | null = null
  objective = -Infinity
  banded = false
  /** The envelope of the last candidate when the window has a footprint (else NaN). */
  envelopeX = NaN
  envelopeY = NaN
  envelopeZ = NaN
  private stage: Stage = Stage.Rules

  private readonly fill: FillFn | null
  private readonly layout: EstimateLayout | null
  /** Per judged key: its slot in the layout, or −1 when the estimator does not report it. */
  private readonly slotOf: Int32Array
  private readonly scalesWithModulus: Uint8Array
  private readonly booleanKey: Uint8Array
  /** Per judged key: 1 when the estimator reports it and its emptiness does not change with the walls. */
  private readonly emptyFixed: Uint8Array
  /**
   * Per judged key: 1 when an empty value is the best it can have — every bound of the window
   * on it is a minimum that an empty value meets without limit (a latch face that locks holds
   * against any pull) and nothing else reads it — so a box corner may be empty on it.
   */
  private readonly emptyBest: Uint8Array
  /** Per judged key: whether the box being bounded had an empty corner on it. */
  private readonly emptySeen: Uint8Array
  /** Per judged key: whether a corner of the box being bounded has given it a value yet (empty included, where empty is not best). */
  private readonly valueSeen: Uint8Array
  /** Scoring an optimistic bound (see bound()) rather than a verdict. */
  private optimistic = false
  private readonly nominal: Float64Array
  private readonly corner: Float64Array
  private readonly low: Float64Array
  private readonly high: Float64Array
  /** Per bound of the window: index into the judged keys. */
  private readonly boundKey: Int32Array
  /** Per bound: the compiled bound's fields in arrays (read once per bound per verdict, millions of times a search). */
  private readonly boundSide: Array<'min' | 'max'>
  private readonly boundSign: Float64Array
  private readonly boundValue: Float64Array
  private readonly boundScale: Float64Array
  /** Per bound: an empty value means unbounded (not missing). */
  private readonly boundUnbounded: Uint8Array
  /** Per bound: an optimistic bound meets it at best (an unbounded minimum on a key whose emptiness changes with the walls). */
  private readonly boundBestWhenOptimistic: Uint8Array
  /**
   * Whether bound()'s optimistic verdict is the nominal verdict itself: no bound of the window
   * is met at best when optimistic, and the safety factor's emptiness does not change with the
   * walls (or there is none). judgeBounded() then takes it instead of judging the nominal again.
   */
  private readonly boundIsVerdict: boolean
  private readonly secondKey: number
  private readonly bistableKey: number
  private readonly safetyKey: number
  /**
   * The walls' own values while a thickness corner is estimated in their place: a plain array
   * of tagged values (it starts with nulls), so a value read from params is put back as the same
   * heap number; a typed array unboxed it, and putting it back allocated a new one.
   */
  private readonly savedWalls: Array<number | null>
  /** A box's own values while its corners are estimated in their place. */
  private savedBox: Array<number | null> = new Array(8).fill(null)
  private readonly thicknessSigns: readonly number[]
  private readonly modulusScales: readonly number[]
  /**
   * The least passing safety factor of the strain rule that applies (window/rule.ts, from the
   * estimate's metric keys), read once: calling the rule per verdict boxed the factor.
   */
  private readonly strainFloor: number

  constructor(readonly ctx: CandidateContext, readonly keys: string[]) {
    this.strainFloor = strainFloor(strainBasis(ctx.estimator.layout?.keys ?? keys))
    this.fill = ctx.estimator.fill ?? null
    this.layout = ctx.estimator.layout ?? null
    const n = keys.length
    this.slotOf = Int32Array.from(keys, (k) => (this.layout ? this.layout.keys.indexOf(k) : -1))
    this.scalesWithModulus = Uint8Array.from(this.slotOf, (s) => (s >= 0 && this.layout!.modulusPower[s] === 1 ? 1 : 0))
    this.booleanKey = Uint8Array.from(this.slotOf, (s) => (s >= 0 && this.layout!.booleans[s] ? 1 : 0))
    this.emptyFixed = Uint8Array.from(this.slotOf, (s) => (s >= 0 && this.layout!.emptyFixed[s] ? 1 : 0))
    this.nominal = new Float64Array(this.layout?.keys.length ?? 0)
    this.corner = new Float64Array(this.layout?.keys.length ?? 0)
    this.low = new Float64Array(n)
    this.high = new Float64Array(n)
    const keyIndex = (k: string) => {
      const i = keys.indexOf(k)
      if (i < 0) throw new Error(`search judges the window metric ${k} but it is not among the judged keys`)
      return i
    }
    this.boundKey = Int32Array.from(ctx.compiled.bounds, (b) => keyIndex(b.metric))
    this.secondKey = ctx.compiled.needsSecondPosition ? keyIndex('secondStablePosition') : -1
    this.bistableKey = keys.indexOf('bistable')
    this.safetyKey = keys.indexOf('safetyFactor')
    const bounds = ctx.compiled.bounds
    this.emptyBest = Uint8Array.from(keys, (_key, k) => (
      this.slotOf[k] >= 0 && !this.booleanKey[k] && k !== this.secondKey && k !== this.bistableKey && k !== this.safetyKey &&
      bounds.every((b, i) => this.boundKey[i] !== k || (b.nullMeans === 'unbounded' && b.side === 'min')) ? 1 : 0))
    this.boundSide = bounds.map((b) => b.side)
    this.boundSign = Float64Array.from(bounds, (b) => b.sign)
    this.boundValue = Float64Array.from(bounds, (b) => b.bound)
    this.boundScale = Float64Array.from(bounds, (b) => b.scale)
    this.boundUnbounded = Uint8Array.from(bounds, (b) => (b.nullMeans === 'unbounded' ? 1 : 0))
    this.boundBestWhenOptimistic = Uint8Array.from(bounds, (b, i) => (b.nullMeans === 'unbounded' && b.side === 'min' && !this.emptyFixed[this.boundKey[i]] ? 1 : 0))
    const sk = this.safetyKey
    this.boundIsVerdict = this.boundBestWhenOptimistic.every((best) => !best) && (sk < 0 || this.slotOf[sk] < 0 || this.emptyFixed[sk] === 1)
    this.savedWalls = ctx.walls.map(() => null)
    this.emptySeen = new Uint8Array(n)
    this.valueSeen = new Uint8Array(n)
    const { thickness: dt, modulus: dE } = ctx.tolerance
    this.thicknessSigns = dt > 0 && ctx.walls.length ? SIGNS : ZERO
    // the corner moduli clamped as catalog/tolerance clamps them, as factors on the nominal
    this.modulusScales = dE > 0 ? SIGNS.map((es) => Math.min(MODULUS_RANGE[1], Math.max(MODULUS_RANGE[0], ctx.modulus * (1 + es * dE))) / ctx.modulus) : []
  }

  /** Judges one candidate; the verdict is left in the fields. */
  judge(params: Record<string, number>): boolean {
    const ctx = this.ctx
    if (!this.fill) return this.take(scoreRecords(ctx, params, this.keys))
    if (this.rulesFail(params)) return this.reject(Stage.Rules, 'rules', -Infinity, null)
    const fpMargin = this.footprintAndNominal(params)
    if (fpMargin === undefined) return false
    return this.fromNominal(params, fpMargin)
  }

  /**
   * judge() for the candidate bound() has just bounded, reusing its footprint and nominal
   * estimate: the same verdict, one estimate fewer.
   */
  judgeBounded(params: Record<string, number>): boolean {
    if (!this.fill) return this.judge(params)
    if (this.rulesFail(params)) return this.reject(Stage.Rules, 'rules', -Infinity, null)
    // bound() stopped at the footprint or the estimate: that verdict stands (its fields are kept)
    if (this.stage === Stage.Footprint || this.stage === Stage.Model) return false
    return this.fromNominal(params, this.footprintMargin, this.boundIsVerdict)
  }

  private rulesFail(params: Record<string, number>): boolean {
    const rules = this.ctx.family.rules
    for (let i = 0; i < rules.length; i++) if (rules[i].check(params)) return true
    return false
  }

  /**
   * The verdict from the nominal estimate in `nominal` on: nominal first, then the band.
   * `nominalJudged`: the fields and the band already hold the nominal verdict (bound() gave it, see boundIsVerdict).
   */
  private fromNominal(params: Record<string, number>, fpMargin: number | null, nominalJudged = false): boolean {
    const ctx = this.ctx
    const { low, high, slotOf, nominal } = this
    if (!nominalJudged) {
      for (let k = 0; k < slotOf.length; k++) {
        const v = slotOf[k] >= 0 ? nominal[slotOf[k]] : NaN
        low[k] = v
        high[k] = v
      }
      // The band contains its nominal point: a nominal outside the window settles it.
      this.verdict(fpMargin, false)
    }
    if (!this.ok) { this.stage = Stage.Nominal; return false }

    const scales = this.modulusScales
    for (const ts of this.thicknessSigns) {
      let values = nominal
      if (ts !== 0) {
        // the walls shifted in params itself and put back (no copy of the record per corner)
        const walls = ctx.walls, saved = this.savedWalls
        const dt = ctx.tolerance.thickness
        for (let i = 0; i < walls.length; i++) {
          const w = walls[i]
          saved[i] = params[w.key]
          params[w.key] = Math.min(w.max, Math.max(w.min, (saved[i] as number) + ts * dt))
        }
        const estimated = this.estimate(params, this.corner)
        for (let i = 0; i < walls.length; i++) params[walls[i].key] = saved[i] as number
        if (!estimated) return this.reject(Stage.Model, 'model', -Infinity, fpMargin)
        values = this.corner
      }
      // corners (ts, ±dE); at ts = 0 only the modulus corners, the nominal being folded already
      if (scales.length) for (const s of scales) this.foldCorner(values, s)
      else if (ts !== 0) this.foldCorner(values, 1)
    }
    this.verdict(fpMargin, true)
    this.stage = Stage.Band
    return this.ok
  }

  /**
   * An upper bound on the verdict from the nominal estimate alone, the rules unchecked: the
   * fields then hold the best the candidate could get — `ok` false only when it certainly
   * fails, `objective`, `windowMargin` and the safety factor no lower than judge() would give.
   * That holds because the band contains the nominal point (its margins and safety factor can
   * only be smaller), a failed rule or corner only makes the verdict worse, and where a band
   * could turn empty where the nominal is not (an unbounded minimum, or an empty safety factor,
   * for metrics whose emptiness changes with the walls) the bound assumes the best.
   * Returns `ok`. Estimators without a raw-number form give no bound (objective +∞).
   */
  bound(params: Record<string, number>): boolean {
    if (!this.fill) {
      this.ok = true
      this.objective = Infinity
      this.windowMargin = Infinity
      this.strainValue = NaN
      return true
    }
    const fpMargin = this.footprintAndNominal(params)
    if (fpMargin === undefined) return false
    const { low, high, slotOf, nominal } = this
    for (let k = 0; k < slotOf.length; k++) {
      const v = slotOf[k] >= 0 ? nominal[slotOf[k]] : NaN
      low[k] = v
      high[k] = v
    }
    this.optimistic = true
    this.verdict(fpMargin, false)
    this.optimistic = false
    this.stage = Stage.Nominal
    return this.ok
  }

  /**
   * bound() for a whole box of candidates at once, from its corners: `params` holds the box's
   * fixed parameters, and each of `keys` (parameters the estimator is monotone in, see
   * FastEstimator.monotoneIn) spans [lows[i], highs[i]]. Every metric of every member then lies
   * between its values at the corners of boxCorners (widened by BOX_SLACK for rounding), so scoring each bound
   * of the window at the hull's better end bounds every member's bound() from above: `ok` false
   * only when every member certainly fails, objective, margin and safety no lower than any
   * member's. A boolean or an emptiness the same at every corner is the same at every member
   * (monotone); where the corners differ on one, no bound is given. Returns null where no bound
   * is given (no raw-number form, a footprint to check, a corner outside the estimate, corners
   * that differ on a boolean or on being empty, where empty is not best), else `ok`.
   */
  boundBox(params: Record<string, number>, keys: readonly string[], lows: Float64Array, highs: Float64Array): boolean | null {
    if (!this.fill || this.ctx.footprint) return null
    const { low, high, slotOf, booleanKey, emptySeen } = this
    const n = keys.length
    // the corners are set in params itself and the box's own values put back at the end
    // tagged, as savedWalls: the values go back as the heap numbers they were
    const saved = this.savedBox.length >= n ? this.savedBox : (this.savedBox = new Array(n).fill(null))
    for (let i = 0; i < n; i++) saved[i] = params[keys[i]]
    const bounded = this.boxHull(params, keys, lows, highs)
    for (let i = 0; i < n; i++) params[keys[i]] = saved[i] as number
    if (!bounded) return null
    // optimistic: each bound scored at the hull's better end (sideMargin reads the low end of a
    // minimum and the high end of a maximum), so the ends are swapped and widened; a key empty
    // at some corner, where empty is best, is left empty (every minimum on it met without limit)
    for (let k = 0; k < slotOf.length; k++) {
      if (emptySeen[k]) { low[k] = NaN; high[k] = NaN; continue }
      if (slotOf[k] < 0 || booleanKey[k]) continue
      const lo = low[k]
      const hi = high[k]
      low[k] = hi + BOX_SLACK * Math.abs(hi)
      high[k] = lo - BOX_SLACK * Math.abs(lo)
    }
    this.optimistic = true
    this.verdict(null, false)
    this.optimistic = false
    this.stage = Stage.Nominal
    return this.ok
  }

  /** boundBox's hull: each judged key's lowest and highest value over the corners into low and high (params left at the last corner); false where no bound is given. */
  private boxHull(params: Record<string, number>, keys: readonly string[], lows: Float64Array, highs: Float64Array): boolean {
    const { low, high, slotOf, booleanKey, emptyBest, emptySeen, valueSeen } = this
    const n = keys.length
    // loops, not fill(): the builtin's call costs more than these few slots
    for (let k = 0; k < emptySeen.length; k++) { emptySeen[k] = 0; valueSeen[k] = 0 }
    const { last, step } = boxCorners(this.ctx.estimator, n)
    for (let c = 0; c <= last; c += step) {
      for (let i = 0; i < n; i++) params[keys[i]] = c & (1 << i) ? highs[i] : lows[i]
      if (!this.estimate(params, this.corner)) return false
      for (let k = 0; k < slotOf.length; k++) {
        if (slotOf[k] < 0) { low[k] = NaN; high[k] = NaN; continue }
        const v = this.corner[slotOf[k]]
        if (Number.isNaN(v) && emptyBest[k]) { emptySeen[k] = 1; continue }
        if (!valueSeen[k]) { low[k] = v; high[k] = v; valueSeen[k] = 1; continue }
        // monotone, a boolean or an emptiness the same at every corner is the same inside: an
        // empty or false value is kept where all corners agree, and voids the bound where not
        if (Number.isNaN(v) !== Number.isNaN(low[k]) || (booleanKey[k] && v !== low[k])) return false
        if (v < low[k]) low[k] = v
        if (v > high[k]) high[k] = v
      }
    }
    return true
  }

  /** The full score of `params` (judged again), with the records the engine reports. */
  score(params: Record<string, number>): CandidateScore {
    if (!this.fill) return scoreRecords(this.ctx, params, this.keys)
    this.judge(params)
    const s = this.scoreJudged()
    return { ok: s.ok, reason: s.reason, windowMargin: s.windowMargin, strainMargin: s.strainMargin, footprintMargin: s.footprintMargin, objective: s.objective, nominal: s.nominal, low: s.low, high: s.high, banded: s.banded }
  }

  /**
   * The full score of the candidate judge() or judgeBounded() has just judged (not after
   * bound() alone), from the raw numbers without estimating again; the nominal record is the
   * estimator's own record form of the same numbers. The raw numbers are copied and the records
   * built only when first read: the engine keeps many candidates for a while (seeds, its running
   * lists) and reads the records of few.
   */
  scoreJudged(): CandidateScore {
    if (!this.fill) return this.recordScore!
    const stage = this.stage < Stage.Nominal ? Stage.Rules : this.stage === Stage.Nominal ? Stage.Nominal : Stage.Band
    let raw: number[] | null = null
    if (stage !== Stage.Rules) {
      // a plain array: a small typed array costs several times as much to allocate, and many are kept
      const { nominal, low, high } = this
      raw = []
      for (let i = 0; i < nominal.length; i++) raw.push(nominal[i])
      if (stage === Stage.Band) {
        for (let k = 0; k < low.length; k++) raw.push(low[k])
        for (let k = 0; k < high.length; k++) raw.push(high[k])
      }
    }
    return new KeptScore(this, stage, raw)
  }

  /** KeptScore's records from its raw numbers: what scoreJudged built at once before. */
  recordsOf(stage: Stage, raw: readonly number[] | null): { nominal: Estimate | null; low: Record<string, MetricValue> | null; high: Record<string, MetricValue> | null } {
    if (stage === Stage.Rules || !raw) return { nominal: null, low: null, high: null }
    const layout = this.layout!
    const nominal: Record<string, MetricValue> = {}
    for (let i = 0; i < layout.keys.length; i++) {
      const v = raw[i]
      nominal[layout.keys[i]] = layout.booleans[i] ? v === 1 : Number.isNaN(v) ? null : v
    }
    if (stage === Stage.Nominal) return { nominal, low: nominal, high: nominal }
    const L = layout.keys.length
    const n = this.keys.length
    const low: Record<string, MetricValue> = { ...nominal }
    const high: Record<string, MetricValue> = { ...nominal }
    for (let k = 0; k < n; k++) {
      if (this.slotOf[k] < 0) continue
      const key = this.keys[k]
      const lo = raw[L + k]
      const hi = raw[L + n + k]
      low[key] = this.booleanKey[k] ? lo === 1 : Number.isNaN(lo) ? null : lo
      high[key] = this.booleanKey[k] ? hi === 1 : Number.isNaN(hi) ? null : hi
    }
    return { nominal, low, high }
  }

  private estimate(params: Record<string, number>, out: Float64Array): boolean {
    try {
      return this.fill!(params, this.ctx.modulus, this.ctx.strainLimit, out, this.ctx.bending)
    } catch {
      return false
    }
  }

  /** Folds one corner into the band: its values, the E-proportional ones times `scale`. An empty value empties the band (as fold does). */
  private foldCorner(values: Float64Array, scale: number): void {
    const { low, high, slotOf, scalesWithModulus } = this
    for (let k = 0; k < slotOf.length; k++) {
      const slot = slotOf[k]
      if (slot < 0) continue
      const v = scalesWithModulus[k] ? values[slot] * scale : values[slot]
      if (Number.isNaN(v) || Number.isNaN(low[k])) { low[k] = NaN; high[k] = NaN; continue }
      if (v < low[k]) low[k] = v
      if (v > high[k]) high[k] = v
    }
  }

  /** judged() on the raw band: the window score (scoreBand), strain and footprint. */
  private verdict(fpMargin: number | null, banded: boolean): void {
    const { low, high, ctx } = this
    const c = ctx.compiled
    let margin = MARGIN_LIMIT
    let binding = -1
    const second = this.secondKey
    const bi = this.bistableKey
    if (second >= 0 && (this.slotOf[second] < 0 || Number.isNaN(low[second]) || Number.isNaN(high[second]) ||
      (bi >= 0 && this.slotOf[bi] >= 0 && (low[bi] === 0 || high[bi] === 0)))) {
      margin = -Infinity
      binding = -2
    } else {
      // each bound's margin on the raw band (an empty value is null, a key the estimator lacks
      // undefined), inline: a number returned from a call V8 does not inline is boxed on the heap
      const { boundKey, slotOf, boundSide, boundSign, boundValue, boundScale, boundUnbounded, boundBestWhenOptimistic, optimistic } = this
      for (let i = 0; i < boundKey.length; i++) {
        const k = boundKey[i]
        let m: number
        if (slotOf[k] < 0) m = -Infinity
        // a band may turn empty where its nominal is not: an unbounded minimum is then met at best
        else if (optimistic && boundBestWhenOptimistic[i]) m = MARGIN_LIMIT
        else {
          const lowV = low[k]
          const highV = high[k]
          const side = boundSide[i]
          if (Number.isNaN(lowV) || Number.isNaN(highV)) {
            m = boundUnbounded[i] && Number.isNaN(lowV) && Number.isNaN(highV) ? (side === 'min' ? MARGIN_LIMIT : -MARGIN_LIMIT) : -Infinity
          } else {
            const up = boundSign[i] === 1
            m = sideMargin(side, up ? lowV : -highV, up ? highV : -lowV, boundValue[i], boundScale[i])
          }
        }
        if (m < margin || binding === -1) { margin = m; binding = i }
      }
    }
    const sk = this.safetyKey
    // NaN for no safety factor (not null: see strainValue)
    const sf = sk >= 0 && this.slotOf[sk] >= 0 && !Number.isNaN(low[sk]) && !(this.optimistic && !this.emptyFixed[sk]) ? low[sk] : NaN
    const strainMargin = sf - 1
    // the shared strain rule (window/rule.ts): a working range ends at a factor of 1 by construction
    const strainOk = Number.isNaN(sf) || sf >= this.strainFloor
    const windowOk = margin >= 0
    let objective = margin
    if (!strainOk && strainMargin < objective) objective = strainMargin
    if (fpMargin !== null && fpMargin < objective) objective = fpMargin
    this.ok = windowOk && strainOk
    this.reason = !windowOk ? (binding === -2 ? 'bistable' : c.bounds[binding].id) : !strainOk ? 'strain' : null
    this.windowMargin = margin
    this.strainValue = strainMargin
    this.footprintMargin = fpMargin
    this.objective = objective
    this.banded = banded
  }

  /**
   * The steps judge() and bound() share: the footprint (which also records the envelope) and
   * the nominal estimate into `nominal`. Returns the footprint margin (null without a
   * footprint), or undefined once the candidate has been rejected by either.
   */
  private footprintAndNominal(params: Record<string, number>): number | null | undefined {
    const ctx = this.ctx
    let fpMargin: number | null = null
    if (ctx.footprint) {
      const env = envelopeOf(ctx, params)
      this.envelopeX = env.x
      this.envelopeY = env.y
      this.envelopeZ = env.z
      fpMargin = footprintMargin(ctx.footprint, env.x, env.y)
      if (fpMargin !== null && fpMargin < 0) {
        this.reject(Stage.Footprint, footprintReason(ctx.footprint, env), fpMargin, fpMargin)
        return undefined
      }
    }
    if (!this.estimate(params, this.nominal)) {
      this.reject(Stage.Model, 'model', -Infinity, fpMargin)
      return undefined
    }
    return fpMargin
  }

  private reject(stage: Stage, reason: string, objective: number, fpMargin: number | null): false {
    this.stage = stage
    this.ok = false
    this.reason = reason
    this.windowMargin = objective
    this.strainValue = NaN
    this.footprintMargin = fpMargin
    this.objective = objective
    this.banded = false
    return false
  }

  /** The record path's last score (estimators without a raw-number form). */
  private recordScore: CandidateScore | null = null

  private take(s: CandidateScore): boolean {
    this.recordScore = s
    this.ok = s.ok
    this.reason = s.reason
    this.windowMargin = s.windowMargin
    this.strainValue = s.strainMargin ?? NaN
    this.footprintMargin = s.footprintMargin
    this.objective = s.objective
    this.banded = s.banded
    return s.ok
  }
}

/** A kept candidate's score: the verdict's numbers at once, the records on first read (CandidateJudge.scoreJudged). */
class KeptScore implements CandidateScore {
  readonly ok: boolean
  readonly reason: string | null
  readonly windowMargin: number
  readonly strainMargin: number | null
  readonly footprintMargin: number | null
  readonly objective: number
  readonly banded: boolean
  private records: ReturnType<CandidateJudge['recordsOf']> | null = null

  constructor(private readonly judge: CandidateJudge, private readonly stage: Stage, private readonly raw: readonly number[] | null) {
    this.ok = judge.ok
    this.reason = judge.reason
    this.windowMargin = judge.windowMargin
    this.strainMargin = judge.strainMargin
    this.footprintMargin = judge.footprintMargin
    this.objective = judge.objective
    this.banded = stage === Stage.Band
  }

  private built() {
    this.records ??= this.judge.recordsOf(this.stage, this.raw)
    return this.records
  }

  get nominal(): Estimate | null { return this.built().nominal }
  get low(): Record<string, MetricValue> | null { return this.built().low }
  get high(): Record<string, MetricValue> | null { return this.built().high }
}
