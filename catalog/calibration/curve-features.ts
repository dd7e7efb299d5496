/**
 * Features read off a force–displacement curve the same way for a measurement and a
 * prediction, so that their differences mean something: the peak force, the valley after
 * it and the initial slope.
 */
import type { SampledCurve } from './types'

/** The initial slope is fitted over the first tenth of the travel (common practice). */
export const INITIAL_SLOPE_FRACTION = 0.1
/** At least this many points go into the initial slope, even on a coarse curve. */
export const MIN_SLOPE_POINTS = 3

export function peakOf(curve: SampledCurve): { index: number; force: number; displacement: number } | null {
  if (curve.force.length === 0) return null
  let index = 0
  for (let i = 1; i < curve.force.length; i++) if (curve.force[i] > curve.force[index]) index = i
  return { index, force: curve.force[index], displacement: curve.displacement[index] }
}

/**
 * The smallest force after the peak (a bistable module's valley); null when the curve ends
 * at its peak, so no valley was reached.
 */
export function valleyOf(curve: SampledCurve): { force: number; displacement: number } | null {
  const peak = peakOf(curve)
  if (!peak || peak.index >= curve.force.length - 1) return null
  let index = peak.index + 1
  for (let i = index + 1; i < curve.force.length; i++) if (curve.force[i] < curve.force[index]) index = i
  // a curve that only levels off after its peak has no valley below the peak
  if (curve.force[index] >= peak.force) return null
  return { force: curve.force[index], displacement: curve.displacement[index] }
}

/**
 * Least-squares slope (with intercept) of the points whose displacement lies within
 * `upTo` of the first point, or the first MIN_SLOPE_POINTS points if fewer lie there.
 */
export function initialSlope(curve: SampledCurve, upTo: number): number | null {
  const n = curve.displacement.length
  if (n < 2) return null
  const d0 = curve.displacement[0]
  let count = 0
  while (count < n && curve.displacement[count] - d0 <= upTo) count++
  count = Math.min(n, Math.max(count, MIN_SLOPE_POINTS))
  let sx = 0, sy = 0, sxx = 0, sxy = 0
  for (let i = 0; i < count; i++) {
    const x = curve.displacement[i]
    const y = curve.force[i]
    sx += x; sy += y; sxx += x * x; sxy += x * y
  }
  const denominator = count * sxx - sx * sx
  if (denominator === 0) return null
  return (count * sxy - sx * sy) / denominator
}
