import { reactive } from 'vue'
import { familiesApi, type SearchResult } from '@/api'
import type { Curve } from '@/api/types'

type CurveState = { status: 'loading' } | { status: 'ready'; curve: Curve } | { status: 'failed'; message: string }

/** Curves of search results, fetched once each and only when a row is shown. */
export function useResultCurves() {
  const curves = reactive(new Map<string, CurveState>())
  const keyOf = (r: SearchResult) => `${r.entryId}|${JSON.stringify(r.params)}`

  /**
   * The exact solver's curve when the result was confirmed with it; otherwise the fast
   * method when it is one of the family's own (a table estimate is not), else the default.
   */
  function request(result: SearchResult, familyMethods: readonly string[] = []) {
    const key = keyOf(result)
    if (curves.has(key)) return
    curves.set(key, { status: 'loading' })
    const method = result.confirmed?.method ?? (familyMethods.includes(result.method) ? result.method : undefined)
    familiesApi.evaluate(result.family, { params: result.params, ...(method ? { method } : {}) })
      .then((e) => curves.set(key, { status: 'ready', curve: e.curve }))
      .catch((e: Error) => curves.set(key, { status: 'failed', message: e.message }))
  }

  function state(result: SearchResult): CurveState | undefined {
    return curves.get(keyOf(result))
  }

  return { request, state, clear: () => curves.clear() }
}
