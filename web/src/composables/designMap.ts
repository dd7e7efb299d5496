/**
 * The design-space map: two parameters of a family swept over the entry's allowed ranges on
 * an n × n grid, every other parameter held at the current configuration. This module holds
 * the request and answer shapes and the grid helpers the page uses; the computation itself is
 * in designMapCompute.ts, which only the web worker (and tests) load, so that the page's
 * bundle does not carry the estimators and the bistable table.
 */
import type { BendingMaterial } from '@catalog/mechanics/wide-beam'

/** Cells along each axis (issue 6: a 60 × 60 grid). */
export const DESIGN_MAP_SIZE = 60

interface MapAxis {
  key: string
  min: number
  max: number
}

export interface DesignMapRequest {
  familyId: string
  /** The current configuration (numbers only); the two swept keys are overwritten per cell. */
  params: Record<string, number>
  modulus: number
  strainLimit: number
  /** Poisson's ratio and wide-beam mode the estimates bend their beams with (catalog/mechanics/wide-beam.ts). */
  bending: BendingMaterial
  x: MapAxis
  y: MapAxis
  /** A force window as the search takes it, or null for no outline. */
  window: unknown | null
  size?: number
}

/** 'monostable': a bistable family's beam springs back (no second position). */
export type CellState = 'ok' | 'monostable' | 'invalid'

export interface DesignMap {
  size: number
  xs: number[]
  ys: number[]
  /** Per metric key, the cell values row by row (index j * size + i, y by j, x by i). */
  values: Record<string, Array<number | null>>
  state: CellState[]
  /** True where the whole tolerance band meets the window (all false without a window). */
  meets: boolean[]
  /** Why a cell fails the window: a bound id (`peakForce.max`), 'strain', 'rules', 'model'. */
  reasons: Array<string | null>
  hasWindow: boolean
  /** Cells estimated per millisecond, for the record. */
  elapsedMs: number
}

/** `n` values from min to max inclusive. */
export function linspace(min: number, max: number, n: number): number[] {
  if (n < 2) return [min]
  return Array.from({ length: n }, (_, i) => min + ((max - min) * i) / (n - 1))
}

/** The cell nearest to a configuration, or null when it lies outside the map. */
export function cellOf(map: Pick<DesignMap, 'xs' | 'ys'>, x: number, y: number): { i: number; j: number } | null {
  const near = (axis: number[], v: number) => {
    const step = axis.length > 1 ? axis[1] - axis[0] : 0
    if (v < axis[0] - step / 2 - 1e-9 || v > axis[axis.length - 1] + step / 2 + 1e-9) return -1
    return step > 0 ? Math.min(axis.length - 1, Math.max(0, Math.round((v - axis[0]) / step))) : 0
  }
  const i = near(map.xs, x)
  const j = near(map.ys, y)
  return i < 0 || j < 0 ? null : { i, j }
}

/** Rounds a swept value to the parameter's step (what the configure form will accept). */
export function snapToStep(value: number, step: number, min: number, max: number): number {
  if (!(step > 0)) return value
  const snapped = Math.round((value - min) / step) * step + min
  const decimals = Math.max(0, -Math.floor(Math.log10(step)) + 1)
  return Number(Math.min(max, Math.max(min, snapped)).toFixed(decimals))
}
