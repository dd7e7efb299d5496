/**
 * What a printer profile (nozzle, layer height) allows. All of it is common FDM practice,
 * not a published standard (docs/references.md §8).
 */
import type { PrinterProfile } from '../window/schema'

/** A 0.4 mm nozzle at 0.2 mm layers: the most common FDM set-up (common practice). */
export const DEFAULT_PRINTER: Readonly<PrinterProfile> = Object.freeze({ nozzle: 0.4, layer: 0.2 })

/**
 * Line (extrusion) width as a multiple of the nozzle. Slicers default to about 1.125 × nozzle
 * for general walls, but thin flexures are normally printed with the line width set to the
 * nozzle itself, so that a wall of n × nozzle is exactly n clean perimeters with no gap fill —
 * the rule of thumb "walls in multiples of the nozzle" (common practice). We use 1.0; a profile
 * may give its own lineWidth.
 */
const LINE_WIDTH_PER_NOZZLE = 1.0
/** Thinnest flexure wall, in perimeters (docs/references.md §8: at least two extrusion widths). */
const MIN_PERIMETERS = 2
/** A wall within 5 % of a line width of a whole number of perimeters counts as whole (our choice). */
export const PERIMETER_TOLERANCE = 0.05
/** A print height within 2 % of a layer of a whole number of layers counts as whole (our choice). */
export const LAYER_TOLERANCE = 0.02
/** Layers above about three quarters of the nozzle bond poorly (common practice). */
export const MAX_LAYER_PER_NOZZLE = 0.75

export interface PrinterRules {
  nozzle: number
  layer: number
  lineWidth: number
  /** MIN_PERIMETERS × lineWidth, mm. */
  minimumWall: number
}

export function printerRules(profile: Partial<PrinterProfile> & { lineWidth?: number } = {}): PrinterRules {
  const nozzle = profile.nozzle ?? DEFAULT_PRINTER.nozzle
  const layer = profile.layer ?? DEFAULT_PRINTER.layer
  const lineWidth = profile.lineWidth ?? nozzle * LINE_WIDTH_PER_NOZZLE
  return { nozzle, layer, lineWidth, minimumWall: MIN_PERIMETERS * lineWidth }
}

const tidy = (v: number) => Number(v.toFixed(6))

/**
 * Most values printableWalls and printableHeights list. The printer bounds (window schema)
 * keep real counts in the hundreds; the cap keeps the work bounded whatever a caller passes.
 */
export const MAX_PRINTABLE_VALUES = 1000

/** Multiples n × unit for n from `first` while n × unit ≤ hi, at most `limit` of them evenly picked. */
function multiples(unit: number, first: number, hi: number, limit: number): number[] {
  if (!(unit > 0) || !Number.isFinite(hi)) return []
  const last = Math.floor(hi / unit + 1e-9)
  const count = last - first + 1
  if (!(count > 0)) return []
  const take = Math.max(1, Math.min(count, Math.floor(limit)))
  const out: number[] = []
  for (let i = 0; i < take; i++) {
    const n = take === 1 ? first : first + Math.round((i * (count - 1)) / (take - 1))
    out.push(tidy(n * unit))
  }
  return out
}

/** The multiple n × unit (first ≤ n, n × unit ≤ hi) nearest to v, the lower on a tie; null when there is none. Constant time. */
function nearestMultiple(unit: number, first: number, hi: number, v: number): number | null {
  if (!(unit > 0) || !Number.isFinite(hi) || !Number.isFinite(v)) return null
  const last = Math.floor(hi / unit + 1e-9)
  if (last < first) return null
  const x = v / unit
  const below = Math.min(last, Math.max(first, Math.floor(x)))
  const above = Math.min(last, Math.max(first, Math.ceil(x)))
  const pick = Math.abs(above * unit - v) < Math.abs(below * unit - v) - 1e-12 ? above : below
  return tidy(pick * unit)
}

const firstWall = (rules: PrinterRules, lo: number) => Math.max(MIN_PERIMETERS, Math.ceil(lo / rules.lineWidth - 1e-9))
const firstHeight = (rules: PrinterRules, lo: number) => Math.max(1, Math.ceil(lo / rules.layer - 1e-9))

/** Wall thicknesses the printer lays down as whole perimeters (≥ the minimum) inside [lo, hi], mm (at most `limit`, evenly picked). */
export function printableWalls(rules: PrinterRules, lo: number, hi: number, limit = MAX_PRINTABLE_VALUES): number[] {
  return multiples(rules.lineWidth, firstWall(rules, lo), hi, limit)
}

/** Print heights that are whole layers inside [lo, hi], mm (at most `limit` of them, evenly picked). */
export function printableHeights(rules: PrinterRules, lo: number, hi: number, limit = MAX_PRINTABLE_VALUES): number[] {
  return multiples(rules.layer, firstHeight(rules, lo), hi, limit)
}

/** The printable wall inside [lo, hi] nearest to v, or null. */
export function nearestPrintableWall(rules: PrinterRules, lo: number, hi: number, v: number): number | null {
  return nearestMultiple(rules.lineWidth, firstWall(rules, lo), hi, v)
}

/** The whole-layer height inside [lo, hi] nearest to v, or null. */
export function nearestPrintableHeight(rules: PrinterRules, lo: number, hi: number, v: number): number | null {
  return nearestMultiple(rules.layer, firstHeight(rules, lo), hi, v)
}

/** The member of `values` nearest to v (the lower on a tie), or null when there is none. */
export function nearest(values: number[], v: number): number | null {
  let best: number | null = null
  for (const x of values) if (best === null || Math.abs(x - v) < Math.abs(best - v) - 1e-12) best = x
  return best
}

export function perimetersOf(rules: PrinterRules, wall: number): number {
  return wall / rules.lineWidth
}
