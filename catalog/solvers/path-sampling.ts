import { SolverError } from '../errors'
import type { PathResult } from './types'

/** Fractional index where `values` first reaches `level` (linear between points), or null. */
export function firstCrossing(values: number[], level: number): number | null {
  for (let i = 1; i < values.length; i++) {
    if (values[i] >= level) return i - 1 + (level - values[i - 1]) / (values[i] - values[i - 1])
  }
  return null
}

/** `values` interpolated linearly at a fractional index. */
export function sampleAt(values: number[], at: number): number {
  const i = Math.min(Math.floor(at), values.length - 2)
  return values[i] + (values[i + 1] - values[i]) * (at - i)
}

/** Indices of the points whose value stays at or below `end` (with a rounding allowance). */
export function indicesUpTo(values: number[], end: number): number[] {
  const indices: number[] = []
  for (let i = 0; i < values.length; i++) if (values[i] <= end * (1 + 1e-9)) indices.push(i)
  return indices
}

export interface StrainLimitedStop {
  /** Fractional index along the path where the working range ends. */
  at: number
  /** True when the strain limit, not the end of the working range, ended it. */
  strainGoverned: boolean
}

/**
 * Where a flexure's working range ends along a solved path: the first point whose strain
 * reaches the limit, or — when the drive stopped at the working-range cap first — the last
 * point. A path that ends short of both is refused rather than reported as a range.
 */
export function strainLimitedStop(path: PathResult, strainLimit: number, cap: number, familyId: string): StrainLimitedStop {
  const atLimit = firstCrossing(path.maxStrain, strainLimit)
  if (atLimit !== null) return { at: atLimit, strainGoverned: true }
  const last = path.control[path.control.length - 1]
  if (last < cap * (1 - 1e-9)) {
    throw new SolverError(`${familyId}: the path ended before the strain limit or the end of the working range`, { control: last })
  }
  return { at: path.control.length - 1, strainGoverned: false }
}
