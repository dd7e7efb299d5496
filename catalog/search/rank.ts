/**
 * Ranking: the margin to the window's edges over the tolerance band first, then strain
 * safety, then footprint area, then a print-time proxy (the envelope volume). Margins and
 * safety factors are compared in bands (5 % of the window, 10 % of safety), so that a
 * hair's difference in margin does not override a clearly safer or smaller part.
 */
import { EDGE_FRACTION } from '../window'

export const MARGIN_BUCKET = EDGE_FRACTION
export const SAFETY_BUCKET = 0.1
/** Safety factors above this all count as ample. */
export const SAFETY_CAP = 5

export interface Rankable {
  windowMargin: number
  safetyFactor: number | null
  /** Envelope area in the build plane, mm². */
  area: number
  /** Envelope volume, mm³ (print-time proxy). */
  volume: number
}

/** First part of the rank key: the margin's band, negated (smaller ranks first). */
export function marginRank(windowMargin: number): number {
  return -Math.floor(windowMargin / MARGIN_BUCKET)
}

/** Second part: the safety factor's band (capped; none counts as ample), negated. */
export function safetyRank(safetyFactor: number | null): number {
  const safety = safetyFactor === null ? SAFETY_CAP : Math.min(SAFETY_CAP, safetyFactor)
  return -Math.floor(safety / SAFETY_BUCKET + 1e-9)
}

export function rankKey(r: Rankable): [number, number, number, number] {
  return [marginRank(r.windowMargin), safetyRank(r.safetyFactor), r.area, r.volume]
}

/** The one ranking: keys in order, then the larger window margin first. */
export function compareRankKeys(ka: readonly number[], kb: readonly number[], marginA: number, marginB: number): number {
  return compareRankParts(ka[0], ka[1], ka[2], ka[3], marginA, kb[0], kb[1], kb[2], kb[3], marginB)
}

/**
 * compareRankKeys on the key's parts as plain numbers (the engine's running lists keep keys in
 * typed arrays): negative when a ranks first.
 */
export function compareRankParts(ma: number, sa: number, areaA: number, volumeA: number, marginA: number, mb: number, sb: number, areaB: number, volumeB: number, marginB: number): number {
  if (ma !== mb) return ma - mb
  if (sa !== sb) return sa - sb
  if (areaA !== areaB) return areaA - areaB
  if (volumeA !== volumeB) return volumeA - volumeB
  return marginB - marginA
}

