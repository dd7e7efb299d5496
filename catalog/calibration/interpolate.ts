/**
 * Linear interpolation on a sampled curve. Predicted curves are sampled along the path, so
 * the abscissa normally rises; where it does not (a snap-back), the first segment that
 * contains x is used.
 */
export function interpolateAt(xs: readonly number[], ys: readonly number[], x: number): number | null {
  for (let i = 0; i + 1 < xs.length; i++) {
    const x0 = xs[i]
    const x1 = xs[i + 1]
    const lo = Math.min(x0, x1)
    const hi = Math.max(x0, x1)
    if (x < lo || x > hi) continue
    if (x1 === x0) return ys[i]
    const t = (x - x0) / (x1 - x0)
    return ys[i] + t * (ys[i + 1] - ys[i])
  }
  if (xs.length === 1 && xs[0] === x) return ys[0]
  return null
}

/** The smallest and largest abscissa of a sampled curve. */
export function extentOf(xs: readonly number[]): [number, number] {
  let lo = Infinity
  let hi = -Infinity
  for (const x of xs) {
    if (x < lo) lo = x
    if (x > hi) hi = x
  }
  return [lo, hi]
}
