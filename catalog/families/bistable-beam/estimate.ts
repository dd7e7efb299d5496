/**
 * Fast estimate of the bistable pair's metrics from the precomputed table (for search):
 * ≥ 10⁶ evaluations per second, within the interpolation error reported by the tests.
 */
import type { MetricValue } from '../../schema/types'
import { interpolateTable, tableCoordinates } from './table'
import { TABLE_METRICS } from './table-build'

const slot = Object.fromEntries(TABLE_METRICS.map((k, i) => [k, i])) as Record<(typeof TABLE_METRICS)[number], number>
const scratch = new Float64Array(TABLE_METRICS.length)

export interface BistableEstimateParams {
  span: number
  apexHeight: number
  thickness: number
  depth: number
  postLength: number
}

/**
 * Metrics with the same keys and units as the nonlinear-fe evaluation, or null when the
 * parameters fall outside the table. `material` gives modulus (MPa) and strainLimit.
 */
export function estimateBistable(p: BistableEstimateParams, material: { modulus: number; strainLimit: number }): Record<string, MetricValue> | null {
  const c = tableCoordinates(p.span, p.apexHeight, p.thickness, p.postLength)
  if (!interpolateTable(c.q, c.eta, c.p, scratch)) return null
  const scale = (2 * material.modulus * ((p.depth * p.thickness ** 3) / 12) * p.apexHeight) / p.span ** 3
  const h = p.apexHeight
  const valley = scratch[slot.valley] * scale
  const bistable = valley < 0
  const second = scratch[slot.secondAt] * h
  const reachesSecond = bistable && scratch[slot.secondAt] < 2 - 1e-9
  const maxStrain = scratch[slot.strain] * ((p.thickness * h) / p.span ** 2)
  return {
    peakForce: scratch[slot.peak] * scale,
    valleyForce: valley,
    unstablePosition: bistable ? scratch[slot.unstableAt] * h : null,
    secondStablePosition: reachesSecond ? second : null,
    energyIn: bistable ? scratch[slot.workIn] * scale * h : null,
    energyBarrier: reachesSecond ? scratch[slot.barrier] * scale * h : null,
    bistable,
    maxStrain,
    strainLimit: material.strainLimit,
    safetyFactor: material.strainLimit / maxStrain,
  }
}

/** Peak force the same beams would give with rigidly clamped ends (postLength 0), N, or null. */
export function estimateRigidPeak(p: Record<string, number>, modulus: number): number | null {
  const e = estimateBistable({ span: p.span, apexHeight: p.apexHeight, thickness: p.thickness, depth: p.depth, postLength: 0 }, { modulus, strainLimit: 1 })
  return e ? (e.peakForce as number) : null
}
