import { reactive } from 'vue'
import { familiesApi, type SearchResult } from '@/api'
import type { Curve } from '@/api/types'

type CurveState = { status: 'loading' } | { status: 'ready'; curve: Curve } | { status: 'failed'; message: string }

/** Curves of search results, fetched once each and only when a row is shown. */
export function useResultCurves() {
  const curves = reactive(new Map<string, CurveState>())
  const keyOf = (r: SearchResult) => `${r.entryId}|${JSON.stringify(r.params)}`

  function request(result: SearchResult) {
    const key = keyOf(result)
    if (curves.has(key)) return
    curves.set(key, { status: 'loading' })
    const method = result.confirmed?.method ?? result.method
    familiesApi.evaluate(result.family, { params: result.params, method })
      .then((e) => curves.set(key, { status: 'ready', curve: e.curve }))
      .catch((e: Error) => curves.set(key, { status: 'failed', message: e.message }))
  }

  function state(result: SearchResult): CurveState | undefined {
    return curves.get(keyOf(result))
  }

  return { request, state, clear: () => curves.clear() }
}
