/**
 * Where to mark a curve: equilibria (force zero) and the extreme forces.
 * An equilibrium is stable where the force rises through zero (positive stiffness dF/dx,
 * a minimum of the stored energy), unstable where it falls through zero.
 */
import type { Curve, MetricValue } from '@/api/types'

export type MarkerKind = 'stable' | 'unstable' | 'peak' | 'valley'

export interface CurveMarker {
  kind: MarkerKind
  x: number
  y: number
}

export interface ZeroCrossing {
  x: number
  /** +1: force rises through zero (stable); −1: it falls (unstable). */
  direction: 1 | -1
}

/** Zero crossings of y(x), linearly interpolated; runs of exact zeros count once. */
export function zeroCrossings(x: readonly number[], y: readonly number[]): ZeroCrossing[] {
  const n = Math.min(x.length, y.length)
  if (n < 2) return []
  const scale = Math.max(...y.slice(0, n).map(Math.abs))
  if (scale === 0) return []
  const eps = scale * 1e-9
  const sign = (v: number) => (v > eps ? 1 : v < -eps ? -1 : 0)
  const out: ZeroCrossing[] = []
  let last = -1 // index of the last point with a sign
  for (let i = 0; i < n; i++) {
    const s = sign(y[i])
    if (s === 0) continue
    if (last === -1) {
      // the curve starts on zero: an equilibrium at the start, classified by where it goes
      if (i > 0) out.push({ x: x[0], direction: s as 1 | -1 })
    } else if (s !== sign(y[last])) {
      const at = i === last + 1
        ? x[last] + (x[i] - x[last]) * (0 - y[last]) / (y[i] - y[last])
        : x[last + 1] // a run of exact zeros: take its first point
      out.push({ x: at, direction: s as 1 | -1 })
    }
    last = i
  }
  return out
}

/** The largest force and where it occurs (first occurrence). */
export function peakPoint(x: readonly number[], y: readonly number[]): { x: number; y: number } | null {
  const n = Math.min(x.length, y.length)
  if (n === 0) return null
  let k = 0
  for (let i = 1; i < n; i++) if (y[i] > y[k]) k = i
  return { x: x[k], y: y[k] }
}

/** The smallest force and where it occurs (first occurrence). */
export function valleyPoint(x: readonly number[], y: readonly number[]): { x: number; y: number } | null {
  const n = Math.min(x.length, y.length)
  if (n === 0) return null
  let k = 0
  for (let i = 1; i < n; i++) if (y[i] < y[k]) k = i
  return { x: x[k], y: y[k] }
}

function numberMetric(metrics: Record<string, MetricValue> | undefined, key: string): number | null {
  const v = metrics?.[key]
  return typeof v === 'number' && Number.isFinite(v) ? v : null
}

/**
 * Markers for a plot: equilibria from the curve, placed at the solver's own positions when
 * the metrics give them (`unstablePosition`, `secondStablePosition`), the peak force when
 * positive and the valley when the curve pulls back (negative force).
 */
export function curveMarkers(curve: Pick<Curve, 'displacement' | 'force'>, metrics?: Record<string, MetricValue>): CurveMarker[] {
  const { displacement: x, force: y } = curve
  const markers: CurveMarker[] = []
  const crossings = zeroCrossings(x, y)
  const unstableAt = numberMetric(metrics, 'unstablePosition')
  const secondAt = numberMetric(metrics, 'secondStablePosition')
  let unstableSeen = false
  let secondSeen = false
  for (const c of crossings) {
    if (c.direction === -1) {
      markers.push({ kind: 'unstable', x: !unstableSeen && unstableAt !== null ? unstableAt : c.x, y: 0 })
      unstableSeen = true
    } else {
      const isSecond = c.x > x[0] && !secondSeen && secondAt !== null
      markers.push({ kind: 'stable', x: isSecond ? secondAt : c.x, y: 0 })
      if (c.x > x[0]) secondSeen = true
    }
  }
  const peak = peakPoint(x, y)
  if (peak && peak.y > 0) markers.push({ kind: 'peak', ...peak })
  const valley = valleyPoint(x, y)
  if (valley && valley.y < 0) markers.push({ kind: 'valley', ...valley })
  return markers
}

export const markerLabels: Record<MarkerKind, string> = {
  stable: 'Stable position',
  unstable: 'Unstable position',
  peak: 'Peak',
  valley: 'Valley',
}

/**
 * The unstable position's marker: an ink ring with a clear middle, so it is outlined on both
 * themes and the curve stays visible through it (a filled marker hid the line where it crosses zero).
 */
export function unstableMarkerStyle(p: { ink: string }): { color: string; borderColor: string; borderWidth: number } {
  return { color: 'rgba(0, 0, 0, 0)', borderColor: p.ink, borderWidth: 2 }
}
