import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, entriesApi, type Entry, asApiError } from '@/api'
import { useReferenceStore } from '@/stores/reference'
import { curveMarkers } from './curveMarkers'
import { allowedMaterials, initialParamModel, paramFields, splitIssues, type ParamFormModel } from './paramForm'
import { keyMetricSpec, type ForceWindow } from './metrics'
import { useLiveEvaluation } from './useLiveEvaluation'

/** Everything the entry page shows and edits: the entry, its family, the form and the live curve. */
export function useEntryPage(id: Ref<string>) {
  const reference = useReferenceStore()
  const entry = shallowRef<Entry | null>(null)
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)
  const selectedRevisionId = ref<number | null>(null)
  const form = ref<ParamFormModel | null>(null)
  const method = ref<string | undefined>(undefined)
  const forceWindow = ref<ForceWindow>({ min: null, max: null })

  async function load() {
    loading.value = true
    error.value = null
    try {
      const [found] = await Promise.all([entriesApi.show(id.value), reference.load()])
      entry.value = found
      selectedRevisionId.value = found.currentRevision?.id ?? found.revisions[0]?.id ?? null
      resetForm()
    } catch (e) {
      entry.value = null
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const family = computed(() => (entry.value ? reference.family(entry.value.familyId) ?? null : null))
  const fields = computed(() => (family.value && entry.value ? paramFields(family.value.params, entry.value.ranges) : []))
  const materials = computed(() => allowedMaterials(reference.materials, entry.value?.materials ?? []))
  const revision = computed(() => entry.value?.revisions.find((r) => r.id === selectedRevisionId.value) ?? null)
  const keyMetric = computed(() => keyMetricSpec(family.value ?? undefined))

  function resetForm() {
    const e = entry.value
    const f = e ? reference.family(e.familyId) : undefined
    if (!e || !f) {
      form.value = null
      return
    }
    form.value = initialParamModel(f.params, e.defaultParams, e.materials, f.bendsBeams)
    method.value = revision.value?.method ?? f.defaultMethod
  }

  const live = useLiveEvaluation(computed(() => family.value?.id ?? null), fields, form, { method })
  const issues = computed(() => splitIssues(live.issues.value, fields.value.map((f) => f.key), family.value?.rules))

  const liveCurve = computed(() => live.result.value?.curve ?? null)
  const storedCurve = computed(() => revision.value?.curve ?? null)
  const markers = computed(() => {
    if (live.result.value) return curveMarkers(live.result.value.curve, live.result.value.metrics)
    return revision.value ? curveMarkers(revision.value.curve, revision.value.metrics) : []
  })

  watch(id, load, { immediate: true })

  return {
    entry, family, fields, materials, revision, selectedRevisionId, keyMetric, form, method, forceWindow,
    loading, error, load, resetForm,
    live, issues, liveCurve, storedCurve, markers,
  }
}
