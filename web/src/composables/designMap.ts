/**
 * The design-space map: two parameters of a family swept over the entry's allowed ranges on
 * an n × n grid, every other parameter held at the current configuration. Each cell is
 * estimated with the family's fast estimator (closed forms, or the bistable table) and, when a
 * force window is given, judged over the tolerance band exactly as search judges candidates.
 * Pure: the web worker runs it, tests call it directly.
 */
import { families } from '@catalog/families'
import { estimatorFor, scoreCandidate } from '@catalog/search'
import type { CandidateContext } from '@catalog/search/candidate'
import { resolveTolerance } from '@catalog/tolerance'
import { compileWindow, parseWindow } from '@catalog/window'
import type { FamilyDefinition, MetricValue } from '@catalog/schema/types'

/** Cells along each axis (issue 6: a 60 × 60 grid). */
export const DESIGN_MAP_SIZE = 60

export interface MapAxis {
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

export function familyOf(id: string): FamilyDefinition {
  const family = families.find((f) => f.id === id)
  if (!family) throw new Error(`unknown module family "${id}"`)
  return family
}

function windowContext(family: FamilyDefinition, req: DesignMapRequest): { ctx: CandidateContext; keys: string[] } | null {
  if (!req.window) return null
  const window = parseWindow(req.window, { materialIds: [] as string[] })
  const compiled = compileWindow(window)
  return {
    ctx: {
      family,
      estimator: estimatorFor(family),
      modulus: req.modulus,
      strainLimit: req.strainLimit,
      tolerance: resolveTolerance(window.tolerance),
      compiled,
      // the map shows the feel over the two parameters; the footprint is search's business
      footprint: undefined,
      walls: family.params.filter((p) => p.role === 'wall').map((p) => ({ key: p.key, min: p.min, max: p.max })),
    },
    keys: [...compiled.metrics, 'bistable'],
  }
}

export function computeDesignMap(req: DesignMapRequest): DesignMap {
  const started = performance.now()
  const size = req.size ?? DESIGN_MAP_SIZE
  const family = familyOf(req.familyId)
  const estimator = estimatorFor(family)
  const judging = windowContext(family, { ...req, window: req.window && typeof req.window === 'object' ? { ...(req.window as object), materials: undefined } : req.window })
  const xs = linspace(req.x.min, req.x.max, size)
  const ys = linspace(req.y.min, req.y.max, size)
  const numeric = family.metrics.filter((m) => m.unit !== 'boolean').map((m) => m.key)
  const values: Record<string, Array<number | null>> = Object.fromEntries(numeric.map((k) => [k, new Array(size * size).fill(null)]))
  const state: CellState[] = new Array(size * size).fill('invalid')
  const meets: boolean[] = new Array(size * size).fill(false)
  const reasons: Array<string | null> = new Array(size * size).fill(null)
  const params = { ...req.params }
  for (let j = 0; j < size; j++) {
    for (let i = 0; i < size; i++) {
      const c = j * size + i
      params[req.x.key] = xs[i]
      params[req.y.key] = ys[j]
      if (family.rules.some((r) => r.check(params))) { reasons[c] = 'rules'; continue }
      let metrics: Record<string, MetricValue>
      try {
        metrics = estimator.estimate(params, req.modulus, req.strainLimit)
      } catch {
        reasons[c] = 'model'
        continue
      }
      for (const k of numeric) {
        const v = metrics[k]
        values[k][c] = typeof v === 'number' && Number.isFinite(v) ? v : null
      }
      state[c] = metrics.bistable === false ? 'monostable' : 'ok'
      if (judging) {
        const score = scoreCandidate(judging.ctx, params, judging.keys)
        meets[c] = score.ok
        reasons[c] = score.reason
      }
    }
  }
  return { size, xs, ys, values, state, meets, reasons, hasWindow: !!judging, elapsedMs: performance.now() - started }
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
