/**
 * The judge reduced to plain loops for search, which judges millions of candidates: the same
 * margins as judge() (a test holds them equal), without building report objects.
 */
import type { MetricValue } from '../schema/types'
import { boundScale, MARGIN_LIMIT, sideMargin } from './rule'
import { quantitiesOf } from './quantities'
import type { ForceWindow, WindowRange } from './schema'

interface CompiledBound {
  /** `peakForce.min`. */
  id: string
  metric: string
  sign: 1 | -1
  side: 'min' | 'max'
  bound: number
  scale: number
  nullMeans: 'missing' | 'unbounded'
}

export interface CompiledWindow {
  bounds: CompiledBound[]
  /** Metric keys whose band search must compute (window metrics plus safetyFactor). */
  metrics: string[]
  /** A bistable window needs a second stable position (metric `secondStablePosition` non-null). */
  needsSecondPosition: boolean
}

export function compileWindow(window: ForceWindow): CompiledWindow {
  const bounds: CompiledBound[] = []
  for (const q of quantitiesOf(window.kind)) {
    const range = (window as unknown as Record<string, WindowRange | undefined>)[q.key]
    if (!range) continue
    for (const side of ['min', 'max'] as const) {
      const bound = range[side]
      if (bound === undefined) continue
      const scale = boundScale(range.min, range.max, bound, q.scaleFloor)
      bounds.push({ id: `${q.key}.${side}`, metric: q.metric, sign: q.sign, side, bound, scale, nullMeans: q.nullMeans })
    }
  }
  const needsSecondPosition = window.kind === 'bistable'
  const metrics = [...new Set([...bounds.map((b) => b.metric), 'safetyFactor', ...(needsSecondPosition ? ['secondStablePosition'] : [])])]
  return { bounds, metrics, needsSecondPosition }
}

/** Margin of one bound over [low, high] (metric sign); −Infinity when the value is missing. */
function boundMargin(b: CompiledBound, low: MetricValue, high: MetricValue): number {
  if (low === null || high === null || typeof low !== 'number' || typeof high !== 'number') {
    if (b.nullMeans === 'unbounded' && low === null && high === null) return b.side === 'min' ? MARGIN_LIMIT : -MARGIN_LIMIT
    return -Infinity
  }
  const lo = b.sign === 1 ? low : -high
  const hi = b.sign === 1 ? high : -low
  return sideMargin(b.side, lo, hi, b.bound, b.scale)
}

export interface WindowScore {
  /** Smallest window margin (MARGIN_LIMIT when the window sets no bound); −Infinity when missing. */
  margin: number
  /** Index into bounds of the binding bound, −1 for none, −2 for a missing second stable position. */
  binding: number
}

/** Smallest margin over the bounds of a band given as parallel low/high records. */
export function scoreBand(c: CompiledWindow, low: Record<string, MetricValue>, high: Record<string, MetricValue>): WindowScore {
  if (c.needsSecondPosition && (typeof low.secondStablePosition !== 'number' || typeof high.secondStablePosition !== 'number' || low.bistable === false || high.bistable === false)) {
    return { margin: -Infinity, binding: -2 }
  }
  let margin = MARGIN_LIMIT
  let binding = -1
  for (let i = 0; i < c.bounds.length; i++) {
    const b = c.bounds[i]
    const m = boundMargin(b, low[b.metric], high[b.metric])
    if (m < margin || binding === -1) { margin = m; binding = i }
  }
  return { margin, binding }
}
