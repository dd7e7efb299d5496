/**
 * The one margin and strain rule of Flexshelf: judge() (reports), the compiled window (search's
 * plain loops) and the candidate judge all take their margins, clamping and strain verdict
 * from here, so the three cannot drift apart.
 */

/** A margin at or below this fraction of the window (but not negative) is 'edge'. */
export const EDGE_FRACTION = 0.05
/** Margins are clamped to ±this (a window bound of 0 would otherwise give infinities). */
export const MARGIN_LIMIT = 1000

export function clampMargin(m: number): number {
  return m > MARGIN_LIMIT ? MARGIN_LIMIT : m < -MARGIN_LIMIT ? -MARGIN_LIMIT : m
}

/**
 * Scale a bound's margin is measured in: the window's width when it has both ends, otherwise
 * the bound itself (at least the quantity's floor, so a bound near zero does not blow up).
 */
export function boundScale(min: number | undefined, max: number | undefined, bound: number, scaleFloor: number): number {
  if (min !== undefined && max !== undefined && max > min) return max - min
  return Math.max(Math.abs(bound), scaleFloor)
}

/** Margin of a [lo, hi] span (in the window's sign) against one side of a bound, clamped. */
export function sideMargin(side: 'min' | 'max', lo: number, hi: number, bound: number, scale: number): number {
  return clampMargin(side === 'min' ? (lo - bound) / scale : (bound - hi) / scale)
}

/**
 * 'working-range': the family reports its travel or rotation up to the strain limit, so its
 * safety factor is 1 at the end of the range by construction; 'peak': the largest strain of
 * the part's own stroke (switches, latches), which must stay under the limit.
 */
export type StrainBasis = 'working-range' | 'peak'

export function strainBasis(metricKeys: Iterable<string>): StrainBasis {
  for (const k of metricKeys) if (k === 'maxTravel' || k === 'maxRotation') return 'working-range'
  return 'peak'
}

/** Rounding allowance on a working range's factor of 1 (interpolated at the limit). */
const RANGE_LIMIT_SLACK = 1e-6

/** The least strain safety factor that passes: 1, less the rounding slack for a working range. */
export function strainFloor(basis: StrainBasis): number {
  return basis === 'working-range' ? 1 - RANGE_LIMIT_SLACK : 1
}

/** Whether a (worst-case) strain safety factor passes: ≥ 1, with the rounding slack for a working range. */
export function strainHolds(safetyFactor: number, basis: StrainBasis | Iterable<string>): boolean {
  return safetyFactor >= strainFloor(typeof basis === 'string' ? (basis as StrainBasis) : strainBasis(basis))
}
