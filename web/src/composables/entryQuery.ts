/**
 * A configuration handed to the entry screen (`/entries/:id?params=<JSON>`, from search or
 * the design map) and the force window the entry screen's map is outlined with.
 */
import type { ModuleKind } from '@/api/types'
import type { ForceWindow } from './metrics'
import type { ParamFormModel } from './paramForm'

/** The `params` query as an object of numbers and strings; null when absent or not JSON. */
export function paramsFromQuery(raw: unknown): Record<string, number | string> | null {
  const text = Array.isArray(raw) ? raw[0] : raw
  if (typeof text !== 'string' || !text) return null
  try {
    const parsed = JSON.parse(text) as unknown
    if (!parsed || typeof parsed !== 'object' || Array.isArray(parsed)) return null
    const out: Record<string, number | string> = {}
    for (const [k, v] of Object.entries(parsed as Record<string, unknown>)) {
      if ((typeof v === 'number' && Number.isFinite(v)) || typeof v === 'string') out[k] = v
    }
    return out
  } catch {
    return null
  }
}

/** The form with the given values on its own fields; unknown keys and materials are left out. */
export function withParams(form: ParamFormModel, params: Record<string, number | string>, fieldKeys: readonly string[], materialIds: readonly string[]): ParamFormModel {
  const values = { ...form.values }
  for (const key of fieldKeys) if (typeof params[key] === 'number') values[key] = params[key] as number
  const material = typeof params.material === 'string' && (!materialIds.length || materialIds.includes(params.material)) ? params.material : form.material
  return { values, material }
}

/** The entry screen's force range as a search window, where the kind's window speaks of force. */
export function entryMapWindow(kind: ModuleKind | null | undefined, window: ForceWindow): Record<string, unknown> | null {
  if (window.min === null && window.max === null) return null
  const range = { ...(window.min !== null ? { min: Math.max(0, window.min) } : {}), ...(window.max !== null ? { max: Math.max(0, window.max) } : {}) }
  if (kind === 'bistable') return { kind, peakForce: range }
  if (kind === 'latch') return { kind, matingForce: range }
  return null
}
