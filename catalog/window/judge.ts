/**
 * Judges a module's metrics (or their tolerance band) against a force window.
 *
 * Margin of one bound, signed, positive inside:
 *   min bound: (value − min) / scale,   max bound: (max − value) / scale,
 * where scale is the window width (max − min) when both bounds are given and non-equal,
 * otherwise |bound| (at least the quantity's scale floor, so a bound of 0 still works).
 * Verdict of a bound: 'outside' when margin < 0, 'edge' when 0 ≤ margin ≤ EDGE_FRACTION,
 * 'inside' above. Over a band, every bound is judged at the band's worst end (low end for a
 * min, high end for a max), so 'inside' for the band means every tolerance corner is inside.
 */
import { boundScale, clampMargin, EDGE_FRACTION, MARGIN_LIMIT, sideMargin, strainBasis, strainHolds } from './rule'
import type { MetricValue } from '../schema/types'
import { quantitiesOf, type WindowQuantity } from './quantities'
import type { ForceWindow, WindowRange } from './schema'

/** A bound closer than 5 % of the window width (or of a one-sided bound) counts as 'edge' (our choice). */
export { EDGE_FRACTION, MARGIN_LIMIT } from './rule'
/** Margins are clamped to ±1000 scales, so an unbounded value (a locking hook) stays a finite JSON number. */

export type Verdict = 'inside' | 'edge' | 'outside'

/** Per metric [low, high] over the tolerance corners; null when a corner has no value. */
export type MetricBand = Record<string, [number, number] | null>
export type Metrics = Record<string, MetricValue>

export interface ConstraintCheck {
  /** `peakForce.min`, `footprint.length`, `bistable`. */
  id: string
  label: string
  unit: string
  /** The bound from the window (window sign: holding force positive). */
  bound: number | null
  /** The value judged (worst end of the band), window sign; null when the metric has none. */
  value: number | null
  /** Signed relative margin, positive inside; null when there is no value to measure. */
  margin: number | null
  verdict: Verdict
}

export interface StrainCheck {
  /**
   * 'peak': the largest strain of the part's own stroke (switches, latches).
   * 'working-range': the family reports its travel or rotation up to the strain limit
   * (springs, guides, hinges), so a factor of 1 is the definition of that range, not a fault.
   */
  basis: 'peak' | 'working-range'
  /** Strain limit over the largest strain (worst over the band). */
  safetyFactor: number
  /** safetyFactor − 1: the fraction of the limit still unused. */
  margin: number
  verdict: Verdict
}

export interface Judgement {
  verdict: Verdict
  /** Smallest constraint margin; null when there is no numeric constraint or a value is missing. */
  margin: number | null
  constraints: ConstraintCheck[]
  /** Strain against the material's limit, judged apart from the window; null when not reported. */
  strain: StrainCheck | null
}

export interface JudgeOptions {
  /** Outer size of the part (FamilyDefinition.envelope), checked against window.footprint. */
  envelope?: { x: number; y: number }
}

function verdictOf(margin: number | null): Verdict {
  if (margin === null || margin < 0) return 'outside'
  return margin <= EDGE_FRACTION ? 'edge' : 'inside'
}

const VERDICT_ORDER: Record<Verdict, number> = { outside: 0, edge: 1, inside: 2 }
function worstVerdict(verdicts: Verdict[]): Verdict {
  return verdicts.reduce<Verdict>((w, v) => (VERDICT_ORDER[v] < VERDICT_ORDER[w] ? v : w), 'inside')
}

function isBand(input: Metrics | MetricBand): input is MetricBand {
  return Object.values(input).some((v) => Array.isArray(v))
}

/** [low, high] of a quantity in the window's sign, or 'missing' / 'unbounded'. */
type Span = [number, number] | 'missing' | 'unbounded'

function spanOf(q: WindowQuantity, input: Metrics | MetricBand, band: boolean): Span {
  const raw = input[q.metric]
  if (raw === null || raw === undefined) return q.nullMeans === 'unbounded' && raw === null ? 'unbounded' : 'missing'
  let lo: number
  let hi: number
  if (band) {
    if (!Array.isArray(raw)) return 'missing'
    ;[lo, hi] = raw as [number, number]
  } else {
    if (typeof raw !== 'number') return 'missing'
    lo = hi = raw
  }
  return q.sign === 1 ? [lo, hi] : [-hi, -lo]
}

function scaleOf(q: WindowQuantity, range: WindowRange, bound: number): number {
  return boundScale(range.min, range.max, bound, q.scaleFloor)
}

function checkBound(q: WindowQuantity, range: WindowRange, side: 'min' | 'max', span: Span): ConstraintCheck {
  const bound = range[side] as number
  const base = { id: `${q.key}.${side}`, label: `${q.label} ${side === 'min' ? 'at least' : 'at most'}`, unit: q.unit, bound }
  if (span === 'missing') return { ...base, value: null, margin: null, verdict: 'outside' }
  if (span === 'unbounded') {
    const margin = side === 'min' ? MARGIN_LIMIT : -MARGIN_LIMIT
    return { ...base, value: null, margin, verdict: verdictOf(margin) }
  }
  const value = side === 'min' ? span[0] : span[1]
  const scale = scaleOf(q, range, bound)
  const margin = sideMargin(side, value, value, bound, scale)
  return { ...base, value, margin, verdict: verdictOf(margin) }
}

function footprintChecks(window: ForceWindow, envelope: { x: number; y: number }): ConstraintCheck[] {
  const fp = window.footprint
  if (!fp || (fp.length === undefined && fp.width === undefined)) return []
  // The part may be turned a quarter in the build plane: judge the better orientation.
  const orient = (along: number, across: number): ConstraintCheck[] => {
    const out: ConstraintCheck[] = []
    if (fp.length !== undefined) {
      const margin = clampMargin((fp.length - along) / fp.length)
      out.push({ id: 'footprint.length', label: 'Length within the footprint', unit: 'mm', bound: fp.length, value: along, margin, verdict: verdictOf(margin) })
    }
    if (fp.width !== undefined) {
      const margin = clampMargin((fp.width - across) / fp.width)
      out.push({ id: 'footprint.width', label: 'Width within the footprint', unit: 'mm', bound: fp.width, value: across, margin, verdict: verdictOf(margin) })
    }
    return out
  }
  const worst = (cs: ConstraintCheck[]) => Math.min(...cs.map((c) => c.margin as number))
  const straight = orient(envelope.x, envelope.y)
  const turned = orient(envelope.y, envelope.x)
  return worst(turned) > worst(straight) ? turned : straight
}

/** Strain against the material's limit from nominal metrics or (band = true) a tolerance band. */
export function judgeStrain(input: Metrics | MetricBand, band: boolean): StrainCheck | null {
  const raw = input.safetyFactor
  const sf = band ? (Array.isArray(raw) ? raw[0] : null) : typeof raw === 'number' ? raw : null
  if (sf === null || sf === undefined) return null
  const margin = clampMargin(sf - 1)
  const basis = strainBasis(Object.keys(input))
  if (basis === 'working-range') {
    // the range ends where the strain reaches the limit: only a factor below 1 is a fault
    return { basis, safetyFactor: sf, margin, verdict: strainHolds(sf, basis) ? 'inside' : 'outside' }
  }
  return { basis, safetyFactor: sf, margin, verdict: !strainHolds(sf, basis) ? 'outside' : verdictOf(margin) }
}

/**
 * Judges nominal metrics (a record of metric values) or a tolerance band (a record of
 * [low, high]) against the window. The window should come from parseWindow.
 */
export function judge(window: ForceWindow, input: Metrics | MetricBand, options: JudgeOptions = {}): Judgement {
  const band = isBand(input)
  const constraints: ConstraintCheck[] = []
  const quantities = quantitiesOf(window.kind)
  for (const q of quantities) {
    const range = (window as unknown as Record<string, WindowRange | undefined>)[q.key]
    if (!range) continue
    const span = spanOf(q, input, band)
    if (range.min !== undefined) constraints.push(checkBound(q, range, 'min', span))
    if (range.max !== undefined) constraints.push(checkBound(q, range, 'max', span))
  }
  if (window.kind === 'bistable') {
    // A bistable window asks for a second stable position even when it sets no holding force.
    const travel = quantities.find((q) => q.key === 'travel')!
    const present = spanOf(travel, input, band) !== 'missing' && input.bistable !== false
    constraints.push({ id: 'bistable', label: 'Has a second stable position', unit: '', bound: null, value: null, margin: null, verdict: present ? 'inside' : 'outside' })
  }
  if (options.envelope) constraints.push(...footprintChecks(window, options.envelope))

  const numeric = constraints.filter((c) => c.id !== 'bistable')
  const missing = constraints.some((c) => c.verdict === 'outside' && c.margin === null)
  const margin = missing || numeric.length === 0 ? null : Math.min(...numeric.map((c) => c.margin as number))
  return { verdict: worstVerdict(constraints.map((c) => c.verdict)), margin, constraints, strain: judgeStrain(input, band) }
}

/** The two verdicts the configure screen shows: nominal, and the whole tolerance band. */
export function judgeWithBand(window: ForceWindow, nominal: Metrics, band: MetricBand, options: JudgeOptions = {}) {
  return { nominal: judge(window, nominal, options), band: judge(window, band, options) }
}
