import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, asApiError } from '@/api'
import { curationApi, type EntryDetail } from '@/api/curation'
import { useReferenceStore } from '@/stores/reference'
import { useSessionStore } from '@/stores/session'
import { allowedMaterials, initialParamModel, paramFields, splitIssues, type ParamFormModel } from './paramForm'
import { initialRangeModel, rangeIssues, rangesBody, type RangeModel } from './rangeEditor'
import { aboutOf, draftBody, lockReason, sortDraftIssues, type AboutModel } from './proposal'
import { useLiveEvaluation } from './useLiveEvaluation'
import { useEntryComments } from './useEntryComments'

/** What the proposal page edits: a new entry, an existing draft, or a change to a released entry. */
export type ProposalMode = { kind: 'new' } | { kind: 'edit'; id: number } | { kind: 'change'; targetId: number }


/** The proposal form: description, default parameters, allowed ranges, live curve, save and submit. */
export function useProposalEditor(mode: Ref<ProposalMode>) {
  const reference = useReferenceStore()
  const session = useSessionStore()
  const entry = shallowRef<EntryDetail | null>(null)
  /** For a change proposal: the released entry it changes. */
  const target = shallowRef<EntryDetail | null>(null)
  const familyId = ref<string | null>(null)
  const about = ref<AboutModel>(aboutOf(null))
  const form = ref<ParamFormModel | null>(null)
  const ranges = ref<RangeModel>({})
  const loading = ref(true)
  const loadError = shallowRef<ApiError | null>(null)
  const saving = ref(false)
  const saveError = shallowRef<ApiError | null>(null)
  const savedBody = ref<string | null>(null)

  const family = computed(() => (familyId.value ? reference.family(familyId.value) ?? null : null))
  const params = computed(() => family.value?.params ?? [])
  const narrowed = computed(() => rangesBody(params.value, ranges.value))
  const fields = computed(() => paramFields(params.value, narrowed.value))
  const materials = computed(() => allowedMaterials(reference.materials, about.value.materials))
  const locked = computed(() => lockReason(entry.value, session.user?.id ?? null))
  const isChange = computed(() => mode.value.kind === 'change' || !!entry.value?.proposalForId)
  const currentRevision = computed(() => {
    const t = target.value
    return t?.revisions.find((r) => r.id === t.currentRevision?.id) ?? null
  })

  function fillFrom(source: EntryDetail | null, fid: string | null) {
    familyId.value = fid
    about.value = aboutOf(source)
    const f = fid ? reference.family(fid) : undefined
    form.value = f ? initialParamModel(f.params, source?.defaultParams ?? {}, source?.materials ?? [], f.bendsBeams) : null
    ranges.value = f ? initialRangeModel(f.params, source?.ranges ?? {}) : {}
  }

  async function load() {
    const m0 = mode.value
    // after the first save the page moves to the draft's own address; it already holds it
    if (m0.kind === 'edit' && entry.value?.id === m0.id && !loadError.value) return
    loading.value = true
    loadError.value = null
    saveError.value = null
    entry.value = null
    target.value = null
    try {
      await reference.load()
      const m = mode.value
      if (m.kind === 'new') {
        fillFrom(null, null)
        savedBody.value = null
      } else if (m.kind === 'change') {
        const t = await curationApi.show(m.targetId)
        target.value = t
        fillFrom(t, t.familyId)
        savedBody.value = null
      } else {
        const e = await curationApi.show(m.id)
        entry.value = e
        if (e.proposalForId) target.value = await curationApi.show(e.proposalForId).catch(() => null)
        fillFrom(e, e.familyId)
        savedBody.value = JSON.stringify(body())
      }
    } catch (e) {
      loadError.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  /** A new family starts from the family's own defaults and limits. */
  function chooseFamily(id: string) {
    familyId.value = id
    const f = reference.family(id)
    form.value = f ? initialParamModel(f.params, {}, about.value.materials, f.bendsBeams) : null
    ranges.value = f ? initialRangeModel(f.params) : {}
  }

  function resetDefaults() {
    const f = family.value
    if (!f) return
    const source = entry.value ?? target.value
    form.value = initialParamModel(f.params, source?.defaultParams ?? {}, about.value.materials, f.bendsBeams)
  }

  // the default material is one the proposal recommends: the first, when the current one is not
  watch(() => about.value.materials, (ids) => {
    if (form.value && ids.length && (!form.value.material || !ids.includes(form.value.material))) form.value.material = ids[0]
  }, { deep: true })

  const live = useLiveEvaluation(computed(() => family.value?.id ?? null), fields, form)

  function body() {
    return draftBody(params.value, about.value, form.value ?? { values: {}, material: null }, ranges.value)
  }
  const dirty = computed(() => savedBody.value === null || JSON.stringify(body()) !== savedBody.value)

  const localIssues = computed(() => {
    const list = rangeIssues(params.value, ranges.value, form.value?.values ?? {})
    if (!about.value.name.trim()) list.unshift({ field: 'name', message: 'name is required: what the entry is called on the shelf' })
    return list
  })
  const issues = computed(() => {
    const serverIssues = saveError.value?.issues ?? []
    return sortDraftIssues([...localIssues.value, ...serverIssues], params.value.map((p) => p.key))
  })
  /** Issues for the default-parameter form: the live evaluation's and the save's. */
  const paramErrors = computed(() => {
    const split = splitIssues(live.issues.value, fields.value.map((f) => f.key), family.value?.rules)
    return { byField: { ...split.byField, ...issues.value.params }, general: split.general }
  })

  /** Saves the draft (creating it the first time); answers the saved entry or null when refused. */
  async function save(): Promise<EntryDetail | null> {
    if (!familyId.value) {
      saveError.value = new ApiError(400, 'validation_failed', 'Pick a module family first.', { issues: [{ field: 'family', message: 'family is required: pick a module family' }] })
      return null
    }
    if (localIssues.value.length) {
      saveError.value = new ApiError(400, 'validation_failed', 'Fix the marked fields first.', null)
      return null
    }
    saving.value = true
    saveError.value = null
    const sent = body()
    try {
      let saved: EntryDetail
      const m = mode.value
      if (entry.value) saved = await curationApi.updateDraft(entry.value.id, sent)
      else if (m.kind === 'change') saved = await curationApi.proposeChange(m.targetId, sent)
      else saved = await curationApi.createDraft(familyId.value, sent)
      entry.value = saved
      savedBody.value = JSON.stringify(sent)
      return saved
    } catch (e) {
      saveError.value = asApiError(e)
      return null
    } finally {
      saving.value = false
    }
  }

  /** Saves unsaved edits, then submits for review. */
  async function submit(): Promise<EntryDetail | null> {
    const saved = dirty.value || !entry.value ? await save() : entry.value
    if (!saved) return null
    saving.value = true
    try {
      const submitted = await curationApi.submit(saved.id)
      entry.value = submitted
      return submitted
    } catch (e) {
      saveError.value = asApiError(e)
      return null
    } finally {
      saving.value = false
    }
  }

  const { posting, commentError, comment } = useEntryComments(entry)

  watch(mode, load, { immediate: true, deep: true })

  return {
    entry, target, family, familyId, about, form, ranges, params, fields, materials, locked, isChange, currentRevision,
    loading, loadError, saving, saveError, dirty, issues, paramErrors, live,
    load, chooseFamily, resetDefaults, save, submit, comment, posting, commentError,
  }
}
