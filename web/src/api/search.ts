/** The search routes (docs/api.md, "Routes (search)"). */
import type { SearchAnswer as CatalogSearchAnswer, SearchProgress, ShelfEntry } from '@catalog/search/types'
import type { z } from 'zod'
import type * as contract from '@contract/api'
import { request } from './client'
import { followEventStream } from './eventStream'

export type { SearchProgress, SearchResult, ShelfEntry } from '@catalog/search/types'

/** The scatter's points of an answer (every kept candidate, capped). */
export type SearchTradeoffs = z.infer<typeof contract.SearchTradeoffs>
export type TradeoffPoint = SearchTradeoffs['points'][number]
/** The catalog's answer as the API sends it, with its trade-off points. */
export type SearchAnswer = CatalogSearchAnswer & { tradeoffs: SearchTradeoffs }

export type SearchJobStart = z.infer<typeof contract.SearchJobStart>

export type SearchJobEvent =
  | { event: 'progress'; data: SearchProgress }
  | { event: 'result'; data: SearchAnswer & { cached: boolean } }
  | { event: 'error'; data: { error: { code: string; message: string; details: Record<string, unknown> | null } } }
  | { event: 'cancelled'; data: { id: string } }

export const searchApi = {
  shelf: () => request<{ entries: ShelfEntry[] }>('GET', '/api/shelf').then((r) => r.entries),
  search: (window: unknown, signal?: AbortSignal) => request<SearchAnswer>('POST', '/api/search', { body: window, signal }),
  start: (window: unknown) => request<SearchJobStart>('POST', '/api/searches', { body: window }),
  follow: (id: string, onEvent: (event: SearchJobEvent) => void, signal?: AbortSignal) =>
    followEventStream(`/api/searches/${encodeURIComponent(id)}/events`, (e) => onEvent(e as SearchJobEvent), signal),
  cancel: (id: string) => request<void>('DELETE', `/api/searches/${encodeURIComponent(id)}`),
}
