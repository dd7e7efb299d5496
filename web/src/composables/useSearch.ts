import { ref, shallowRef } from 'vue'
import { ApiError, isAbort, searchApi, type SearchAnswer, type SearchProgress, asApiError } from '@/api'
import { emptySearchForm, toWindow, type SearchForm } from './searchWindow'

/** Results asked for per search; the table pages through them. */
const RESULT_LIMIT = 60

export type SearchStatus = 'idle' | 'running' | 'done' | 'cancelled' | 'failed'

/** The search screen's state: the form, the running job's progress, the answer, cancel. */
export function useSearch() {
  const form = ref<SearchForm>(emptySearchForm())
  const status = ref<SearchStatus>('idle')
  const progress = shallowRef<SearchProgress | null>(null)
  const answer = shallowRef<(SearchAnswer & { cached?: boolean }) | null>(null)
  const error = shallowRef<ApiError | null>(null)
  /** The window the answer belongs to (the form may have changed since). */
  const searched = shallowRef<Record<string, unknown> | null>(null)
  let jobId: string | null = null
  let following: AbortController | null = null

  async function run() {
    await cancel()
    const window = toWindow(form.value, RESULT_LIMIT)
    status.value = 'running'
    progress.value = null
    error.value = null
    const mine = new AbortController()
    following = mine
    try {
      const started = await searchApi.start(window)
      jobId = started.id
      if (mine.signal.aborted) { await searchApi.cancel(started.id).catch(() => undefined); return }
      await searchApi.follow(started.id, (e) => {
        if (following !== mine) return
        if (e.event === 'progress') progress.value = e.data
        else if (e.event === 'result') {
          answer.value = e.data
          searched.value = window
          status.value = 'done'
        } else if (e.event === 'cancelled') status.value = 'cancelled'
        else {
          error.value = new ApiError(500, e.data.error.code, e.data.error.message, e.data.error.details)
          status.value = 'failed'
        }
      }, mine.signal)
      if (following === mine && status.value === 'running') throw new ApiError(0, 'network', 'The search stopped answering; try again.')
    } catch (e) {
      if (isAbort(e) || following !== mine) return
      error.value = asApiError(e)
      status.value = 'failed'
    } finally {
      if (following === mine) { following = null; jobId = null }
    }
  }

  /** Stops following and asks the server to stop the job. */
  async function cancel() {
    const id = jobId
    if (!following) return
    following.abort()
    following = null
    jobId = null
    status.value = 'cancelled'
    if (id) await searchApi.cancel(id).catch(() => undefined)
  }

  return { form, status, progress, answer, error, searched, run, cancel }
}
