/**
 * A result's curve as a small SVG drawing with the force window on it: bands for force
 * bounds (peak, holding, mating, separation), a wedge of slopes for stiffness bounds.
 */
import type { Curve } from '@/api/types'
import type { WindowKind } from '@catalog/window/quantities'
import { RAD_PER_DEG } from '@catalog/units'

export interface SparkWindow {
  /** Horizontal bands [low, high] in the curve's force unit (null ends are open). */
  bands: Array<[number | null, number | null]>
  /** Slopes (force per displacement unit) bounding a stiffness window. */
  slopes: Array<[number | null, number | null]>
}

type Range = { min?: number; max?: number } | undefined

/** What of a window can be drawn on a force–displacement (or moment–rotation) curve. */
export function sparkWindow(kind: WindowKind, window: Record<string, unknown> | null, curve: Curve): SparkWindow {
  const out: SparkWindow = { bands: [], slopes: [] }
  if (!window) return out
  const r = (key: string) => window[key] as Range
  const pair = (x: Range): [number | null, number | null] | null => (x && (x.min !== undefined || x.max !== undefined) ? [x.min ?? null, x.max ?? null] : null)
  if (kind === 'bistable') {
    const peak = pair(r('peakForce'))
    if (peak) out.bands.push(peak)
    const hold = pair(r('holdingForce'))
    // holding force is the valley's depth below zero: valley ≤ −min
    if (hold) out.bands.push([hold[1] === null ? null : -hold[1], hold[0] === null ? null : -hold[0]])
  } else if (kind === 'latch') {
    const mating = pair(r('matingForce'))
    if (mating) out.bands.push(mating)
  } else {
    const s = pair(r(kind === 'hinge' ? 'rotationalStiffness' : 'stiffness'))
    // a hinge's stiffness is per radian; its curve may be drawn in degrees
    const perUnit = kind === 'hinge' && curve.axes.displacement.unit === 'deg' ? RAD_PER_DEG : 1
    if (s) out.slopes.push([s[0] === null ? null : s[0] * perUnit, s[1] === null ? null : s[1] * perUnit])
  }
  return out
}

export interface Sparkline {
  path: string
  rects: Array<{ x: number; y: number; width: number; height: number }>
  lines: Array<{ x1: number; y1: number; x2: number; y2: number }>
  zeroY: number | null
}

/** The drawing in a width × height box (SVG y grows downwards). */
export function sparkline(curve: Curve, window: SparkWindow, width: number, height: number, pad = 3): Sparkline {
  const xs = curve.displacement
  const ys = curve.force
  const finite = (v: number | null): v is number => v !== null && Number.isFinite(v)
  const bandYs = window.bands.flat().filter(finite)
  let x0 = Math.min(...xs)
  let x1 = Math.max(...xs)
  let y0 = Math.min(0, ...ys, ...bandYs)
  let y1 = Math.max(0, ...ys, ...bandYs)
  if (!(x1 > x0)) x1 = x0 + 1
  if (!(y1 > y0)) y1 = y0 + 1
  const span = y1 - y0
  y0 -= span * 0.06
  y1 += span * 0.06
  const sx = (x: number) => pad + ((x - x0) / (x1 - x0)) * (width - 2 * pad)
  const sy = (y: number) => pad + ((y1 - y) / (y1 - y0)) * (height - 2 * pad)
  const clampY = (y: number) => Math.min(height - pad, Math.max(pad, y))
  const path = xs.map((x, i) => `${i ? 'L' : 'M'}${sx(x).toFixed(1)},${sy(ys[i]).toFixed(1)}`).join('')
  const rects = window.bands.map(([lo, hi]) => {
    const top = clampY(hi === null ? pad : sy(hi))
    const bottom = clampY(lo === null ? height - pad : sy(lo))
    return { x: pad, y: top, width: width - 2 * pad, height: Math.max(1, bottom - top) }
  })
  const lines = window.slopes.flat().filter(finite).map((k) => {
    // the line F = k·x from the origin to the edge of the box
    const xEnd = k > 0 ? Math.min(x1, y1 / k) : x1
    return { x1: sx(0), y1: sy(0), x2: sx(xEnd), y2: clampY(sy(k * xEnd)) }
  })
  return { path, rects, lines, zeroY: y0 < 0 && y1 > 0 ? sy(0) : null }
}
