import type { ForceWindow } from '../window'

/** A stable key for caching answers by window: the parsed window as JSON with sorted keys. */
export function windowCacheKey(window: ForceWindow): string {
  const sort = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(sort)
    if (v && typeof v === 'object') return Object.fromEntries(Object.keys(v).sort().map((k) => [k, sort((v as Record<string, unknown>)[k])]))
    return v
  }
  return JSON.stringify(sort(window))
}
