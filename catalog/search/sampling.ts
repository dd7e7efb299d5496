/**
 * The candidate grid of one entry: its allowed ranges sampled on printable increments —
 * walls in whole perimeters of the printer's line width, print heights in whole layers,
 * counts in whole numbers, other lengths and angles at evenly spaced levels on the
 * parameter's step — thinned so the grid stays inside a budget.
 */
import { PRINT_HEIGHT_KEYS, printableHeights, printableWalls, type PrinterRules } from '../printability'
import type { FamilyDefinition, ParamSpec } from '../schema/types'
import type { ShelfEntry } from './types'

type AxisKind = 'wall' | 'height' | 'count' | 'continuous' | 'fixed'

export interface Axis {
  spec: ParamSpec
  kind: AxisKind
  lo: number
  hi: number
  /** The grid values of the axis (thinned to the budget). */
  values: number[]
  /** Smallest move that stays printable: a line width, a layer, 1, or the parameter's step. */
  step?: number
}

export interface EntryGrid {
  axes: Axis[]
  /** Why the entry cannot be sampled at all (no printable wall inside its range), or null. */
  problem: string | null
}

const tidy = (v: number) => Number(v.toPrecision(12))

export function snapToStep(spec: ParamSpec, v: number, lo: number, hi: number, step = spec.step): number {
  const snapped = tidyMultiple(Math.round(v / step), step)
  return snapped < lo - 1e-12 || snapped > hi + 1e-12 ? v : snapped
}

/**
 * tidy(k · step), kept by its whole number k and step in a small direct-mapped table: a search
 * snaps the same few levels over and over (each entry's grid at every level count, each
 * refinement trial), and toPrecision costs about 0.2 µs.
 */
function tidyMultiple(k: number, step: number): number {
  const slot = (Math.imul(k | 0, 0x9e3779b1) ^ Math.imul((step * 1048576) | 0, 0x85ebca6b)) >>> (32 - SNAP_BITS)
  if (snapK[slot] === k && snapStep[slot] === step) return snapValue[slot]
  const value = tidy(k * step)
  snapK[slot] = k
  snapStep[slot] = step
  snapValue[slot] = value
  return value
}

const SNAP_BITS = 12
const snapK = new Float64Array(1 << SNAP_BITS).fill(NaN)
const snapStep = new Float64Array(1 << SNAP_BITS)
const snapValue = new Float64Array(1 << SNAP_BITS)

function levels(spec: ParamSpec, lo: number, hi: number, n: number): number[] {
  if (hi <= lo || n <= 1) return [lo]
  const out = new Set<number>()
  for (let i = 0; i < n; i++) out.add(snapToStep(spec, lo + ((hi - lo) * i) / (n - 1), lo, hi))
  return [...out].sort((a, b) => a - b)
}

/** n values of a sorted list, evenly picked, ends kept. */
function thin(values: number[], n: number): number[] {
  if (values.length <= n) return values
  if (n <= 1) return [values[Math.floor(values.length / 2)]]
  const out = new Set<number>()
  for (let i = 0; i < n; i++) out.add(values[Math.round((i * (values.length - 1)) / (n - 1))])
  return [...out]
}

/**
 * What an axis is before it is thinned to a number of levels: fixed, or its kind, range and
 * the printable values it is picked from (null for a continuous one, levelled on its step).
 */
type AxisBase =
  | { fixed: Axis }
  | { fixed: null; spec: ParamSpec; kind: Exclude<AxisKind, 'fixed'>; lo: number; hi: number; fallback: number; allowed: number[] | null; step: number; keepsDefault: boolean }

function axisBase(spec: ParamSpec, entry: ShelfEntry, rules: PrinterRules): AxisBase | string {
  const base = axisRange(spec, entry, rules)
  if (typeof base === 'string' || base.fixed) return base
  // The librarian's default is a proven configuration: kept on the grid when it is printable
  // (decided once here, not for every number of levels tried)
  const { lo, hi, fallback, allowed } = base
  base.keepsDefault = fallback >= lo && fallback <= hi && (!allowed || allowed.some((v) => Math.abs(v - fallback) < 1e-9))
  return base
}

function axisRange(spec: ParamSpec, entry: ShelfEntry, rules: PrinterRules): AxisBase | string {
  const given = entry.defaultParams[spec.key]
  const fallback = typeof given === 'number' ? given : spec.default
  const range = entry.ranges[spec.key]
  if (!range) return { fixed: { spec, kind: 'fixed', lo: fallback, hi: fallback, values: [fallback] } }
  const lo = Math.max(spec.min, range[0])
  const hi = Math.min(spec.max, range[1])
  if (hi <= lo) return { fixed: { spec, kind: 'fixed', lo, hi: lo, values: [lo] } }
  if (spec.role === 'wall') {
    const walls = printableWalls(rules, lo, hi)
    if (!walls.length) return `${spec.label} ${lo}–${hi} ${spec.unit} holds no printable wall on a ${rules.nozzle} mm nozzle (at least ${rules.minimumWall} mm, in ${rules.lineWidth} mm perimeters)`
    return { fixed: null, spec, kind: 'wall', lo, hi, fallback, allowed: walls, step: rules.lineWidth, keepsDefault: false }
  }
  if ((PRINT_HEIGHT_KEYS as readonly string[]).includes(spec.key)) {
    const heights = printableHeights(rules, lo, hi)
    if (heights.length) return { fixed: null, spec, kind: 'height', lo, hi, fallback, allowed: heights, step: rules.layer, keepsDefault: false }
  }
  if (spec.integer) {
    const counts: number[] = []
    for (let n = Math.ceil(lo); n <= hi; n++) counts.push(n)
    return { fixed: null, spec, kind: 'count', lo, hi, fallback, allowed: counts, step: 1, keepsDefault: false }
  }
  return { fixed: null, spec, kind: 'continuous', lo, hi, fallback, allowed: null, step: spec.step, keepsDefault: false }
}

function axisOf(base: Exclude<AxisBase, { fixed: Axis }>, maxLevels: number): Axis {
  const { spec, kind, lo, hi, fallback, allowed, step } = base
  const values = allowed ? thin(allowed, maxLevels) : levels(spec, lo, hi, maxLevels)
  return { spec, kind, lo, hi, values: base.keepsDefault && !values.includes(fallback) ? withValue(values, fallback) : values, step }
}

/** A sorted list with one more value in its place (a copy). */
function withValue(sorted: readonly number[], value: number): number[] {
  const out: number[] = []
  let placed = false
  for (const v of sorted) {
    if (!placed && value < v) { out.push(value); placed = true }
    out.push(v)
  }
  if (!placed) out.push(value)
  return out
}

/** Largest levels per axis (at most 9) whose full grid fits the budget. */
export function entryGrid(family: FamilyDefinition, entry: ShelfEntry, rules: PrinterRules, budget: number): EntryGrid {
  // each axis's range and printable values once; only the thinning depends on the levels
  const bases: AxisBase[] = []
  for (const spec of family.params) {
    const base = axisBase(spec, entry, rules)
    if (typeof base === 'string') return { axes: [], problem: base }
    bases.push(base)
  }
  let best: Axis[] | null = null
  for (let n = 9; n >= 2; n--) {
    const axes = bases.map((base) => base.fixed ?? axisOf(base, n))
    best = axes
    if (gridSize(axes) <= budget) break
  }
  return { axes: best ?? [], problem: null }
}

export function gridSize(axes: Axis[]): number {
  return axes.reduce((n, a) => n * a.values.length, 1)
}

/** Each grid point in turn (the same object, refilled: copy it to keep it). */
export function* gridPoints(axes: Axis[]): Generator<Record<string, number>> {
  const params: Record<string, number> = {}
  const index = new Array(axes.length).fill(0)
  for (let i = 0; i < axes.length; i++) params[axes[i].spec.key] = axes[i].values[0]
  for (;;) {
    yield params
    let k = axes.length - 1
    while (k >= 0) {
      index[k]++
      if (index[k] < axes[k].values.length) { params[axes[k].spec.key] = axes[k].values[index[k]]; break }
      index[k] = 0
      params[axes[k].spec.key] = axes[k].values[0]
      k--
    }
    if (k < 0) return
  }
}

/**
 * The grid points in the same order as gridPoints, stepped by `next()` without a generator's
 * result object per point: the search's hot loop. `params` is refilled in place.
 */
export class GridCursor {
  private readonly index: Int32Array
  private started = false
  private done: boolean

  /** `params`: the record to fill (a block's cursor fills its axes of the outer cursor's record). */
  constructor(private readonly axes: Axis[], readonly params: Record<string, number> = {}) {
    this.index = new Int32Array(axes.length)
    for (let i = 0; i < axes.length; i++) this.params[axes[i].spec.key] = axes[i].values[0]
    this.done = axes.some((a) => a.values.length === 0)
  }

  /** Back to before the first point. */
  reset(): void {
    this.index.fill(0)
    for (let i = 0; i < this.axes.length; i++) this.params[this.axes[i].spec.key] = this.axes[i].values[0]
    this.started = false
    this.done = this.axes.some((a) => a.values.length === 0)
  }

  /** Moves to the next point (the first on the first call); false when the grid is done. */
  next(): boolean {
    if (this.done) return false
    if (!this.started) { this.started = true; return true }
    const { axes, index, params } = this
    let k = axes.length - 1
    while (k >= 0) {
      index[k]++
      if (index[k] < axes[k].values.length) { params[axes[k].spec.key] = axes[k].values[index[k]]; return true }
      index[k] = 0
      params[axes[k].spec.key] = axes[k].values[0]
      k--
    }
    this.done = true
    return false
  }
}
