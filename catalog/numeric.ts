/** Relative tolerance used by every floating-point comparison in the core. */
const RELATIVE_EPSILON = 1e-9

/** True when a and b agree to a relative (or, near zero, absolute) tolerance. */
export function nearlyEqual(a: number, b: number, tolerance = RELATIVE_EPSILON): boolean {
  const scale = Math.max(1, Math.abs(a), Math.abs(b))
  return Math.abs(a - b) <= tolerance * scale
}

/** Rounds for display and JSON output without changing the computed values used elsewhere. */
export function roundTo(value: number, significant = 6): number {
  if (!Number.isFinite(value) || value === 0) return value
  return Number(value.toPrecision(significant))
}
