/**
 * The search form: a force window per kind of module, in the units the window speaks
 * (N, N/mm, N·mm/rad, mm, deg), turned into the window JSON the API takes (docs/api.md).
 * Presets are starting points for common parts, in Flexshelf's own words.
 */
import { windowKinds, windowQuantities, type WindowKind } from '@catalog/window/quantities'

export type { WindowKind }
export { windowKinds, windowQuantities }

interface RangeInput {
  min: number | null
  max: number | null
}

export interface SearchForm {
  kind: WindowKind
  /** Per window quantity key (`peakForce`), in the quantity's unit. */
  ranges: Record<string, RangeInput>
  footprint: { length: number | null; width: number | null }
  materials: string[]
  printer: { nozzle: number | null; layer: number | null }
  /** Wall thickness ± mm, and modulus ± per cent (the window takes a fraction). */
  tolerance: { thickness: number | null; modulusPercent: number | null }
  text: string
}

export interface SearchPreset {
  id: string
  label: string
  /** One line saying what the preset asks for. */
  hint: string
  kind: WindowKind
  ranges: Record<string, RangeInput>
  footprint?: { length?: number; width?: number }
}

export const kindWords: Record<WindowKind, { label: string; hint: string }> = {
  bistable: { label: 'Snap-over switch', hint: 'Two stable positions; you set the force to snap it over and the force that holds it.' },
  spring: { label: 'Spring', hint: 'Pushes back in proportion to travel; you set its stiffness and how far it must go.' },
  guide: { label: 'Straight-line guide', hint: 'Carries a slider along a line; you set its stiffness and travel.' },
  hinge: { label: 'Hinge', hint: 'Bends about a line; you set its rotational stiffness and how far it must turn.' },
  latch: { label: 'Latch', hint: 'Snaps in and holds; you set the force to push it home and the force it takes to pull apart.' },
}

export const searchPresets: readonly SearchPreset[] = [
  { id: 'push-light', label: 'Push switch, light touch', hint: 'snaps at 2–4 N, holds with 0.3 N or more', kind: 'bistable', ranges: { peakForce: { min: 2, max: 4 }, holdingForce: { min: 0.3, max: null } } },
  { id: 'push-gloved', label: 'Power switch for a gloved thumb', hint: 'snaps at 4–8 N, holds with 0.8 N or more', kind: 'bistable', ranges: { peakForce: { min: 4, max: 8 }, holdingForce: { min: 0.8, max: null } } },
  { id: 'battery-door', label: 'Battery-door latch', hint: 'closes under 20 N, takes 10 N or more to pull open', kind: 'latch', ranges: { matingForce: { min: null, max: 20 }, separationForce: { min: 10, max: null } } },
  { id: 'button-return', label: 'Return spring for a button', hint: '0.2–1 N/mm with 2 mm of travel or more', kind: 'spring', ranges: { stiffness: { min: 0.2, max: 1 }, travel: { min: 2, max: null } } },
  { id: 'lid-hinge', label: 'Lid hinge that swings freely', hint: 'under 200 N·mm/rad, turns 30° or more', kind: 'hinge', ranges: { rotationalStiffness: { min: null, max: 200 }, rotation: { min: 30, max: null } } },
  { id: 'slider-guide', label: 'Guide for a sliding cover', hint: 'under 2 N/mm with 1 mm of travel or more', kind: 'guide', ranges: { stiffness: { min: null, max: 2 }, travel: { min: 1, max: null } } },
]

const emptyRanges = (kind: WindowKind): Record<string, RangeInput> =>
  Object.fromEntries(windowQuantities[kind].map((q) => [q.key, { min: null, max: null }]))

export function emptySearchForm(kind: WindowKind = 'bistable'): SearchForm {
  return {
    kind,
    ranges: emptyRanges(kind),
    footprint: { length: null, width: null },
    materials: [],
    printer: { nozzle: 0.4, layer: 0.2 },
    tolerance: { thickness: 0.05, modulusPercent: 10 },
    text: '',
  }
}

/** Switches the kind, keeping what does not depend on it (footprint, materials, printer, text). */
export function withKind(form: SearchForm, kind: WindowKind): SearchForm {
  if (form.kind === kind) return form
  return { ...form, kind, ranges: emptyRanges(kind) }
}

export function applyPreset(form: SearchForm, preset: SearchPreset): SearchForm {
  const next = withKind(form, preset.kind)
  const ranges = emptyRanges(preset.kind)
  for (const [key, r] of Object.entries(preset.ranges)) ranges[key] = { ...r }
  return {
    ...next,
    kind: preset.kind,
    ranges,
    footprint: { length: preset.footprint?.length ?? form.footprint.length, width: preset.footprint?.width ?? form.footprint.width },
  }
}

const given = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v)

/** The window JSON: only what the engineer filled in, every part optional but `kind`. */
export function toWindow(form: SearchForm, limit?: number): Record<string, unknown> {
  const window: Record<string, unknown> = { kind: form.kind }
  for (const q of windowQuantities[form.kind]) {
    const r = form.ranges[q.key]
    if (!r || (!given(r.min) && !given(r.max))) continue
    window[q.key] = { ...(given(r.min) ? { min: r.min } : {}), ...(given(r.max) ? { max: r.max } : {}) }
  }
  if (given(form.footprint.length) || given(form.footprint.width)) {
    window.footprint = { ...(given(form.footprint.length) ? { length: form.footprint.length } : {}), ...(given(form.footprint.width) ? { width: form.footprint.width } : {}) }
  }
  if (form.materials.length) window.materials = [...form.materials]
  if (given(form.printer.nozzle) || given(form.printer.layer)) {
    window.printer = { ...(given(form.printer.nozzle) ? { nozzle: form.printer.nozzle } : {}), ...(given(form.printer.layer) ? { layer: form.printer.layer } : {}) }
  }
  if (given(form.tolerance.thickness) || given(form.tolerance.modulusPercent)) {
    window.tolerance = {
      ...(given(form.tolerance.thickness) ? { thickness: form.tolerance.thickness } : {}),
      ...(given(form.tolerance.modulusPercent) ? { modulus: Math.round(form.tolerance.modulusPercent * 10) / 1000 } : {}),
    }
  }
  if (form.text.trim()) window.text = form.text.trim()
  if (limit !== undefined) window.limit = limit
  return window
}

/**
 * Where a server issue belongs on the form: `peakForce.min` → that input, `tolerance.modulus`
 * → the per-cent input, anything else to the general list.
 */
export function issueField(field: string): string {
  if (field === 'tolerance.modulus') return 'tolerance.modulusPercent'
  if (field.startsWith('materials')) return 'materials'
  return field
}
