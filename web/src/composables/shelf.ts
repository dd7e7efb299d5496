/** The shelf's rows and filters, as pure functions of the entries and families. */
import type { EntryStatus, EntrySummary, Family, MetricSpec, MetricValue } from '@/api/types'
import { keyMetricSpec } from './metrics'

export interface ShelfRow extends EntrySummary {
  keyMetric: { spec: MetricSpec; value: MetricValue } | null
  /** The key metric as a number for sorting; null sorts last. */
  keyValue: number | null
  updatedTime: number
}

export interface ShelfFilters {
  text: string
  families: string[]
  statuses: EntryStatus[]
  tags: string[]
}

export function emptyFilters(): ShelfFilters {
  return { text: '', families: [], statuses: [], tags: [] }
}

export function shelfRows(entries: readonly EntrySummary[], families: readonly Family[]): ShelfRow[] {
  return entries.map((entry) => {
    const spec = keyMetricSpec(families.find((f) => f.id === entry.familyId))
    const value = spec ? entry.currentRevision?.metrics[spec.key] ?? null : null
    return {
      ...entry,
      keyMetric: spec ? { spec, value } : null,
      keyValue: typeof value === 'number' ? value : null,
      updatedTime: Date.parse(entry.updatedAt) || 0,
    }
  })
}

/** Every word of the text must appear in the name, summary, family or tags (any order, any case). */
export function filterRows<T extends EntrySummary>(rows: readonly T[], filters: ShelfFilters): T[] {
  const words = filters.text.toLowerCase().split(/\s+/).filter(Boolean)
  return rows.filter((row) => {
    if (filters.families.length && !filters.families.includes(row.familyId)) return false
    if (filters.statuses.length && !filters.statuses.includes(row.status)) return false
    if (filters.tags.length && !filters.tags.every((t) => row.tags.includes(t))) return false
    if (!words.length) return true
    const haystack = [row.name, row.summary, row.familyName, ...row.tags].join(' ').toLowerCase()
    return words.every((w) => haystack.includes(w))
  })
}

export function tagsOf(entries: readonly EntrySummary[]): string[] {
  return [...new Set(entries.flatMap((e) => e.tags))].sort((a, b) => a.localeCompare(b))
}

/** Sorts numbers ascending with missing values last, whichever way the column is sorted. */
export function compareNullable(a: number | null, b: number | null): number {
  if (a === null && b === null) return 0
  if (a === null) return 1
  if (b === null) return -1
  return a - b
}
