import { computed, onBeforeUnmount, ref, shallowRef, watch, type Ref } from 'vue'
import { asApiError, entriesApi, type ApiError, type Entry, type FieldIssue } from '@/api'
import { configurationsApi, configureApi, type CheckResult, type Configuration, type SavedConfiguration, type SavedTarget } from '@/api/configure'
import { useReferenceStore } from '@/stores/reference'
import { curveMarkers } from './curveMarkers'
import { allowedMaterials, initialParamModel, localIssues, paramFields, splitIssues, type ParamFormModel } from './paramForm'
import { buildConfiguration, datasheetQuery, mergeParams, readLinkedConfiguration, settingsFrom, sortIssues, type SettingsForm } from './configurationState'
import { applyFix, printerIssues, toleranceIssues } from './printSettings'
import { useLatestRequest } from './useLatestRequest'

/** Where the screen's configuration comes from: an entry (with an optional link), a saved one, or a shared link. */
export type ConfigurationSource =
  | { kind: 'entry'; entryId: string; query: Record<string, unknown> }
  | { kind: 'saved'; entryId: string; configurationId: string }
  | { kind: 'shared'; token: string }


/**
 * Everything the configure screen shows and edits: the entry and its family, the parameter
 * form, the engineer's window, tolerance and printer, and the server's check of it all,
 * re-run (debounced, superseded requests cancelled) whenever any of it changes.
 */
export function useConfiguration(source: Ref<ConfigurationSource>, options: { debounceMs?: number; check?: typeof configureApi.check } = {}) {
  const reference = useReferenceStore()
  const checkRequest = options.check ?? configureApi.check
  const entry = shallowRef<Entry | null>(null)
  const saved = shallowRef<SavedConfiguration | null>(null)
  const loading = ref(true)
  const loadError = shallowRef<ApiError | null>(null)
  const linkProblems = ref<FieldIssue[]>([])
  const form = ref<ParamFormModel | null>(null)
  const settings = ref<SettingsForm | null>(null)

  const readOnly = computed(() => source.value.kind === 'shared')
  const family = computed(() => (entry.value ? reference.family(entry.value.familyId) ?? null : null))
  // a saved configuration is checked under the ranges of the revision it was saved from
  const ranges = computed(() => {
    const e = entry.value
    const from = saved.value?.savedRevision?.id
    return (from !== undefined && e?.revisions.find((r) => r.id === from)?.ranges) || e?.ranges || {}
  })
  const fields = computed(() => (family.value && entry.value ? paramFields(family.value.params, ranges.value) : []))
  let savedJson: string | null = null
  const materials = computed(() => allowedMaterials(reference.materials, entry.value?.materials ?? []))

  async function load() {
    loading.value = true
    loadError.value = null
    linkProblems.value = []
    const s = source.value
    try {
      let config: SavedConfiguration | null = null
      if (s.kind === 'saved') config = await configurationsApi.show(s.configurationId)
      if (s.kind === 'shared') config = await configurationsApi.shared(s.token)
      const entryId = s.kind === 'shared' ? String(config!.entry.id) : s.entryId
      const [found] = await Promise.all([entriesApi.show(entryId), reference.load()])
      entry.value = found
      saved.value = config
      const f = reference.family(found.familyId)
      if (!f) {
        form.value = null
        settings.value = null
        return
      }
      const linked = s.kind === 'entry' ? readLinkedConfiguration(s.query) : null
      if (linked) linkProblems.value = linked.problems
      const given = config ? config.params : linked?.params ?? null
      form.value = initialParamModel(f.params, mergeParams(found.defaultParams, given), found.materials, f.bendsBeams)
      settings.value = settingsFrom(f.kind, config ?? linked, found.revisions.find((r) => r.id === found.currentRevision?.id)?.method ?? f.defaultMethod)
      if (settings.value.method && !f.methods.some((m) => m.id === settings.value!.method)) settings.value.method = f.defaultMethod
      savedJson = config ? JSON.stringify(buildConfiguration(f.kind, form.value, settings.value)) : null
    } catch (e) {
      entry.value = null
      loadError.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const configuration = computed<Configuration | null>(() =>
    family.value && form.value && settings.value ? buildConfiguration(family.value.kind, form.value, settings.value) : null)

  /**
   * While a saved or shared configuration is as it was saved, its own routes answer (what was
   * saved, under its revision's ranges); once edited it is a new configuration of the entry.
   */
  const savedTarget = computed<SavedTarget | null>(() => {
    const s = source.value
    if (s.kind === 'entry' || !saved.value || !configuration.value) return null
    if (s.kind === 'shared') return { kind: 'shared', key: s.token }
    return JSON.stringify(configuration.value) === savedJson ? { kind: 'saved', key: String(saved.value.id) } : null
  })

  /** Where the files of the configuration on screen come from. */
  const files = computed(() => {
    const e = entry.value
    const config = configuration.value
    if (!e || !config) return null
    const t = savedTarget.value
    const sheetQuery: Record<string, string> = t ? { [t.kind === 'saved' ? 'configuration' : 'shared']: t.key } : datasheetQuery(config)
    return {
      stl: t ? configurationsApi.stlPath(t) : configureApi.stlPath(e.id, config),
      csv: t ? configurationsApi.csvPath(t) : configureApi.csvPath(e.id, config),
      datasheet: { name: 'datasheet', params: { id: String(e.id) }, query: sheetQuery },
    }
  })

  const localProblems = computed(() => {
    if (!form.value || !settings.value) return { params: [] as FieldIssue[], tolerance: { thickness: '', modulus: '' }, printer: { nozzle: '', layer: '' } }
    return {
      params: localIssues(fields.value, form.value.values),
      tolerance: toleranceIssues(settings.value.tolerance),
      printer: printerIssues(settings.value.printer),
    }
  })
  const hasLocalProblems = computed(() => {
    const l = localProblems.value
    return l.params.length > 0 || Object.values(l.tolerance).some(Boolean) || Object.values(l.printer).some(Boolean)
  })

  // the server's check, re-run after a pause in editing
  const check = useLatestRequest<CheckResult>({
    debounceMs: options.debounceMs ?? 350,
    prepare: () => {
      const e = entry.value
      const config = configuration.value
      if (!e || !config) return null
      if (hasLocalProblems.value) return { issues: [] }
      const t = savedTarget.value
      return { send: (signal) => (t ? configurationsApi.check(t, signal) : checkRequest(e.id, config, signal)) }
    },
  })
  const { result, pending, run: runCheck, cancel } = check
  const serverIssues = check.issues
  const checkError = check.error
  function scheduleCheck() {
    if (configuration.value) check.schedule()
  }

  const sorted = computed(() => sortIssues(serverIssues.value))
  const paramIssues = computed(() => splitIssues(
    [...localProblems.value.params, ...sorted.value.params],
    fields.value.map((f) => f.key),
    family.value?.rules,
  ))
  const toleranceErrors = computed(() => ({
    thickness: localProblems.value.tolerance.thickness || sorted.value.tolerance.thickness || '',
    modulus: localProblems.value.tolerance.modulus || sorted.value.tolerance.modulus || '',
  }))
  const printerErrors = computed(() => ({
    nozzle: localProblems.value.printer.nozzle || sorted.value.printer.nozzle || '',
    layer: localProblems.value.printer.layer || sorted.value.printer.layer || '',
  }))

  /** The check belongs to the form as it is now (not to an earlier edit or a failed one). */
  const current = computed(() => !pending.value && !hasLocalProblems.value && serverIssues.value.length === 0 && !checkError.value && result.value !== null)
  const markers = computed(() => (result.value ? curveMarkers(result.value.evaluation.curve, result.value.evaluation.metrics) : []))
  /** Numeric parameters for the 3D preview, only while the form is valid. */
  const previewParams = computed<Record<string, number> | null>(() => {
    if (!form.value || localProblems.value.params.length) return null
    const out: Record<string, number> = {}
    for (const [k, v] of Object.entries(form.value.values)) if (typeof v === 'number') out[k] = v
    return out
  })

  function resetForm() {
    const e = entry.value
    const f = family.value
    if (!e || !f) return
    form.value = initialParamModel(f.params, e.defaultParams, e.materials, f.bendsBeams)
  }

  /** Applies a printability fix; false when the parameter changed since the check. */
  function fix(change: { key: string; from: number; to: number }): boolean {
    if (!form.value || readOnly.value) return false
    const next = applyFix(form.value, change)
    if (!next) return false
    form.value = next
    return true
  }

  watch(source, load, { immediate: true, deep: true })
  watch([configuration, hasLocalProblems], scheduleCheck, { deep: true })
  onBeforeUnmount(cancel)

  return {
    entry, family, fields, materials, saved, savedTarget, files, readOnly, loading, loadError, linkProblems, form, settings, configuration,
    result, pending, checkError, current, markers, previewParams, paramIssues, windowErrors: computed(() => sorted.value.window),
    toleranceErrors, printerErrors, otherIssues: computed(() => sorted.value.other),
    load, resetForm, fix, runCheck,
  }
}
