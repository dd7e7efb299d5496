/** The compare route (docs/api.md, "Compare"): up to four search results or saved configurations side by side. */
import type { z } from 'zod'
import type * as contract from '@contract/api'
import { request } from './client'

// The answer's shape comes from the wire contract (contract/api.ts), type-only.
export type Comparison = z.infer<typeof contract.Comparison>
export type ComparedCandidate = z.infer<typeof contract.ComparedCandidate>
/** What the compare query names: a result's entry and parameters, or a saved configuration. */
export type CompareItem = { entryId: number; params?: Record<string, number | string> } | { configurationId: number }

/** `?items=[…]` as the compare routes (JSON, CSV, PDF) take it. */
export const compareQuery = (items: CompareItem[]) => `items=${encodeURIComponent(JSON.stringify(items))}`

export const compareApi = {
  compare: (items: CompareItem[]) => request<{ comparison: Comparison }>('GET', `/api/compare?${compareQuery(items)}`).then((r) => r.comparison),
}
