import { onBeforeUnmount, watch, type Ref } from 'vue'
import { familiesApi } from '@/api'
import type { Evaluation } from '@/api/types'
import { evaluationParams, localIssues, type ParamField, type ParamFormModel } from './paramForm'
import { useLatestRequest } from './useLatestRequest'

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
  const latest = useLatestRequest<Evaluation>({
    debounceMs,
    prepare: () => {
      const id = familyId.value
      const current = form.value
      if (!id || !current) return null
      const local = localIssues(fields.value, current.values)
      if (local.length) return { issues: local }
      return { send: (signal) => evaluate(id, { params: evaluationParams(current), method: options.method?.value }, signal) }
    },
  })
  const { result, issues, error, pending, run, schedule, cancel } = latest

  watch([familyId, form, () => options.method?.value], schedule, { deep: true })
  onBeforeUnmount(cancel)

  return { result, issues, error, pending, evaluateNow: run, cancel }
}
