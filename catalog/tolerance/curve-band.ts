/**
 * Low and high force of several curves at each displacement of the nominal curve.
 * Each curve is interpolated linearly onto the nominal grid; a curve that folds back
 * (snap-back under arc-length control) can cross one displacement more than once, and every
 * crossing counts. A curve that does not reach a displacement leaves it to the others.
 */
import type { Curve } from '../schema/types'

export interface CurveBand {
  displacement: number[]
  low: number[]
  high: number[]
}

/** Every force at which the polyline (xs, ys) passes displacement x. */
export function valuesAt(xs: number[], ys: number[], x: number): number[] {
  const out: number[] = []
  if (xs.length === 1 && xs[0] === x) out.push(ys[0])
  for (let i = 0; i + 1 < xs.length; i++) {
    const x0 = xs[i]
    const x1 = xs[i + 1]
    if ((x < Math.min(x0, x1)) || (x > Math.max(x0, x1))) continue
    if (x0 === x1) { out.push(ys[i], ys[i + 1]); continue }
    const s = (x - x0) / (x1 - x0)
    out.push(ys[i] + s * (ys[i + 1] - ys[i]))
  }
  return out
}

export function curveBand(nominal: Curve, others: Curve[]): CurveBand {
  const displacement = nominal.displacement.slice()
  const low = nominal.force.slice()
  const high = nominal.force.slice()
  for (const curve of others) {
    for (let i = 0; i < displacement.length; i++) {
      for (const f of valuesAt(curve.displacement, curve.force, displacement[i])) {
        if (f < low[i]) low[i] = f
        if (f > high[i]) high[i] = f
      }
    }
  }
  return { displacement, low, high }
}
