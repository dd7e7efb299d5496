import { ref, shallowRef } from 'vue'
import { ApiError, isAbort, type FieldIssue, asApiError } from '@/api'

/**
 * What to do on a run: null when there is nothing to ask yet (state left as it is),
 * `{ issues }` when the input is already known to be wrong (no request; those issues shown),
 * or `{ send }` to ask the server.
 */
type RequestPlan<T> = null | { issues: FieldIssue[] } | { send: (signal: AbortSignal) => Promise<T> }

export interface LatestRequestOptions<T> {
  prepare: () => RequestPlan<T>
  /** Quiet time after the last edit before asking, ms. */
  debounceMs: number
}

/**
 * Runs a request after a pause in editing: a newer run cancels the one in flight, and answers
 * to superseded runs are ignored, so the screen always shows the answer to the latest edit.
 * Field issues from the server land in `issues`; other failures in `error`.
 */
export function useLatestRequest<T>(options: LatestRequestOptions<T>) {
  const result = shallowRef<T | null>(null)
  const issues = ref<FieldIssue[]>([])
  const error = shallowRef<ApiError | null>(null)
  const pending = ref(false)
  let timer: ReturnType<typeof setTimeout> | null = null
  let inFlight: AbortController | null = null
  let sequence = 0

  async function run() {
    timer = null
    const plan = options.prepare()
    if (!plan) return
    inFlight?.abort()
    if ('issues' in plan) {
      sequence++ // answers to earlier edits are stale now
      issues.value = plan.issues
      error.value = null
      pending.value = false
      return
    }
    const mine = ++sequence
    const controller = new AbortController()
    inFlight = controller
    pending.value = true
    try {
      const answer = await plan.send(controller.signal)
      if (mine !== sequence) return
      result.value = answer
      issues.value = []
      error.value = null
    } catch (e) {
      if (isAbort(e) || mine !== sequence) return
      const apiError = asApiError(e)
      issues.value = apiError.issues
      error.value = apiError.code === 'validation_failed' ? null : apiError
    } finally {
      if (mine === sequence) {
        pending.value = false
        inFlight = null
      }
    }
  }

  function schedule() {
    if (timer) clearTimeout(timer)
    pending.value = true
    timer = setTimeout(run, options.debounceMs)
  }

  function cancel() {
    if (timer) clearTimeout(timer)
    timer = null
    inFlight?.abort()
    inFlight = null
    sequence++
    pending.value = false
  }

  return { result, issues, error, pending, run, schedule, cancel }
}
