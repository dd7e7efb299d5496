import { onBeforeUnmount, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, familiesApi, isAbort, type FieldIssue } from '@/api'
import type { Evaluation } from '@/api/types'
import { evaluationParams, localIssues, type ParamField, type ParamFormModel } from './paramForm'

export interface LiveEvaluationOptions {
  /** Quiet time after the last edit before asking the server, ms. */
  debounceMs?: number
  method?: Ref<string | undefined>
  evaluate?: typeof familiesApi.evaluate
}

/**
 * Re-evaluates a configuration as it is edited: waits for a pause in typing, cancels the
 * request in flight when a newer one starts and ignores answers to superseded edits.
 */
export function useLiveEvaluation(familyId: Ref<string | null>, fields: Ref<ParamField[]>, form: Ref<ParamFormModel | null>, options: LiveEvaluationOptions = {}) {
  const debounceMs = options.debounceMs ?? 300
  const evaluate = options.evaluate ?? familiesApi.evaluate
  const result = shallowRef<Evaluation | null>(null)
  const issues = ref<FieldIssue[]>([])
  const error = shallowRef<ApiError | null>(null)
  const pending = ref(false)
  let timer: ReturnType<typeof setTimeout> | null = null
  let inFlight: AbortController | null = null
  let sequence = 0

  async function run() {
    timer = null
    const id = familyId.value
    const current = form.value
    if (!id || !current) return
    const local = localIssues(fields.value, current.values)
    inFlight?.abort()
    if (local.length) {
      sequence++ // answers to earlier edits are stale now
      issues.value = local
      error.value = null
      pending.value = false
      return
    }
    const mine = ++sequence
    const controller = new AbortController()
    inFlight = controller
    pending.value = true
    try {
      const answer = await evaluate(id, { params: evaluationParams(current), method: options.method?.value }, controller.signal)
      if (mine !== sequence) return
      result.value = answer
      issues.value = []
      error.value = null
    } catch (e) {
      if (isAbort(e) || mine !== sequence) return
      const apiError = e instanceof ApiError ? e : new ApiError(0, 'internal', e instanceof Error ? e.message : String(e))
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
    timer = setTimeout(run, debounceMs)
  }

  function cancel() {
    if (timer) clearTimeout(timer)
    timer = null
    inFlight?.abort()
    inFlight = null
    sequence++
    pending.value = false
  }

  watch([familyId, form, () => options.method?.value], schedule, { deep: true })
  onBeforeUnmount(cancel)

  return { result, issues, error, pending, evaluateNow: run, cancel }
}
