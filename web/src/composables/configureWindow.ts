/**
 * The engineer's force window as a form, by kind of module, and back to the window JSON the
 * server judges (catalog/window/schema.ts). Labels and units come from the catalog's
 * `windowQuantities`, so the form and the verdict speak of the same quantities.
 */
import { windowQuantities, type WindowKind } from '@catalog/window/quantities'
import type { ForceWindow } from '@catalog/window/schema'

type WindowSide = 'min' | 'max'

interface WindowInputField {
  /** `peakForce.min`: also the input's id suffix (`#window-peakForce-min`). */
  id: string
  quantity: string
  side: WindowSide
  label: string
  unit: string
}

/**
 * Which bounds the form offers per kind: what an engineer usually specifies for the feel
 * of each kind of part (a snap-over force range and a holding force for a switch, a mating
 * force limit and a separation force floor for a hook). The window JSON accepts more; a
 * saved or pasted window keeps its other bounds.
 */
const windowSides: Readonly<Record<WindowKind, Readonly<Record<string, readonly WindowSide[]>>>> = {
  bistable: { peakForce: ['min', 'max'], holdingForce: ['min'], travel: ['max'] },
  spring: { stiffness: ['min', 'max'], travel: ['min'] },
  guide: { stiffness: ['min', 'max'], travel: ['min'] },
  hinge: { rotationalStiffness: ['min', 'max'], rotation: ['min'] },
  latch: { matingForce: ['max'], separationForce: ['min'] },
}

const sideWords: Record<WindowSide, string> = { min: 'at least', max: 'at most' }

export interface WindowGroup {
  quantity: string
  label: string
  unit: string
  fields: WindowInputField[]
}

/** The form's groups for a kind: one per quantity, with its min and/or max input. */
export function windowGroups(kind: WindowKind): WindowGroup[] {
  const sides = windowSides[kind]
  return windowQuantities[kind]
    .filter((q) => sides[q.key]?.length)
    .map((q) => ({
      quantity: q.key,
      label: q.label,
      unit: q.unit,
      fields: sides[q.key].map((side) => ({ id: `${q.key}.${side}`, quantity: q.key, side, label: `${q.label} ${sideWords[side]}`, unit: q.unit })),
    }))
}

/** The form's values: `{ peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5, max: null } }`. */
export type WindowForm = Record<string, { min: number | null; max: number | null }>

export function emptyWindowForm(kind: WindowKind): WindowForm {
  const form: WindowForm = {}
  for (const q of windowQuantities[kind]) form[q.key] = { min: null, max: null }
  return form
}

const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)

/** A window (saved, shared, from the link) as form values; quantities of other kinds are ignored. */
export function windowToForm(kind: WindowKind, window: Partial<ForceWindow> | null | undefined): WindowForm {
  const form = emptyWindowForm(kind)
  if (!window || (window.kind && window.kind !== kind)) return form
  const raw = window as Record<string, unknown>
  for (const key of Object.keys(form)) {
    const r = raw[key] as { min?: unknown; max?: unknown } | undefined
    if (!r || typeof r !== 'object') continue
    form[key] = { min: isNumber(r.min) ? r.min : null, max: isNumber(r.max) ? r.max : null }
  }
  return form
}

/**
 * The window JSON for the form, or null when no bound is set (the server then checks the
 * configuration without a verdict). Empty sides are left out, as the schema wants.
 */
export function windowFromForm(kind: WindowKind, form: WindowForm): ForceWindow | null {
  const window: Record<string, unknown> = { kind }
  let any = false
  for (const q of windowQuantities[kind]) {
    const r = form[q.key]
    if (!r) continue
    const range: { min?: number; max?: number } = {}
    if (isNumber(r.min)) range.min = r.min
    if (isNumber(r.max)) range.max = r.max
    if (range.min === undefined && range.max === undefined) continue
    window[q.key] = range
    any = true
  }
  return any ? (window as unknown as ForceWindow) : null
}

/** The window's bounds in words for a summary line: "Peak force 3–5 N · Holding force at least 0.5 N". */
export function describeWindow(kind: WindowKind, window: ForceWindow | null): string {
  if (!window) return 'No force window set'
  const raw = window as unknown as Record<string, { min?: number; max?: number } | undefined>
  const parts: string[] = []
  for (const q of windowQuantities[kind]) {
    const r = raw[q.key]
    if (!r) continue
    const unit = q.unit ? ` ${q.unit}` : ''
    if (r.min !== undefined && r.max !== undefined) parts.push(`${q.label} ${r.min}–${r.max}${unit}`)
    else if (r.min !== undefined) parts.push(`${q.label} at least ${r.min}${unit}`)
    else if (r.max !== undefined) parts.push(`${q.label} at most ${r.max}${unit}`)
  }
  return parts.length ? parts.join(' · ') : 'No force window set'
}

/**
 * The entry page's one-line window (a range on the key metric) as a window of the kind, when
 * the key metric is one the window speaks of (peak force, stiffness, …); null otherwise.
 */
export function windowFromKeyMetric(kind: WindowKind, metricKey: string | null | undefined, range: { min: number | null; max: number | null }): ForceWindow | null {
  const q = windowQuantities[kind].find((x) => x.key === metricKey && x.metric === metricKey && x.sign === 1)
  if (!q) return null
  const form = emptyWindowForm(kind)
  form[q.key] = { min: range.min, max: range.max }
  return windowFromForm(kind, form)
}
