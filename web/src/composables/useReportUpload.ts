import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, asApiError } from '@/api'
import { reportFormData, reportsApi, type ReportUploadFields, type TestReportWithEntry } from '@/api/curation'
import type { AxisSpec } from '@/api/types'
import { fileUnitChoices } from '@catalog/units'
import { firstProblem, previewCsv, previewCurve, serverProblemLocation, type CsvPreview } from './csvPreview'

/** The units a file may be in, from the entry's axes: rotation and moment files are read as they are. */
export function unitChoices(axes: { displacement: AxisSpec; force: AxisSpec } | undefined) {
  return fileUnitChoices(axes?.displacement.unit)
}

export interface UploadContext {
  entryId: number
  axes: { displacement: AxisSpec; force: AxisSpec } | undefined
  /** The revision the report tests (the current one unless picked). */
  revisionId: number | null
  /** The material the revision's prediction used, as the starting choice. */
  material: string | null
}

/** The upload form: files, the preview of the CSV, column and unit choices, print details, and the server's verdict. */
export function useReportUpload(context: Ref<UploadContext>) {
  const file = shallowRef<File | null>(null)
  const photo = shallowRef<File | null>(null)
  const preview = shallowRef<CsvPreview | null>(null)
  const readError = ref('')
  const hasHeader = ref<'auto' | 'yes' | 'no'>('auto')
  const displacementColumn = ref(0)
  const forceColumn = ref(1)
  const units = computed(() => unitChoices(context.value.axes))
  const fields = ref<Omit<ReportUploadFields, 'displacementColumn' | 'forceColumn' | 'hasHeader'>>(blankFields())
  const sending = ref(false)
  const serverError = shallowRef<ApiError | null>(null)

  function blankFields() {
    const u = unitChoices(context.value.axes)
    return {
      revisionId: context.value.revisionId ?? undefined,
      printer: '', material: context.value.material ?? '', lot: '', orientation: '', testSpeed: null as number | null, notes: '',
      displacementUnit: u.displacement[0], forceUnit: u.force[0],
    }
  }

  function reset() {
    file.value = null
    photo.value = null
    preview.value = null
    readError.value = ''
    hasHeader.value = 'auto'
    serverError.value = null
    fields.value = blankFields()
  }

  async function readPreview() {
    preview.value = null
    readError.value = ''
    const f = file.value
    if (!f) return
    try {
      const text = await f.text()
      const p = previewCsv(text, hasHeader.value)
      preview.value = p
      displacementColumn.value = p.guess.displacement
      forceColumn.value = p.guess.force
    } catch (e) {
      readError.value = `The file could not be read here: ${e instanceof Error ? e.message : String(e)}`
    }
  }

  watch([file, hasHeader], readPreview)
  watch([file, photo, fields, displacementColumn, forceColumn], () => { serverError.value = null }, { deep: true })

  const problem = computed(() => (preview.value ? firstProblem(preview.value, displacementColumn.value, forceColumn.value) : null))
  const curve = computed(() => (preview.value ? previewCurve(preview.value, displacementColumn.value, forceColumn.value, fields.value.displacementUnit, fields.value.forceUnit) : null))
  const columnOptions = computed(() => Array.from({ length: preview.value?.columnCount ?? 0 }, (_, i) => ({
    value: i,
    label: preview.value?.header?.[i] ? `${i + 1}: ${preview.value.header[i]}` : `Column ${i + 1}`,
  })))

  /** Required fields the browser checks before sending (the server checks again). */
  const missing = computed(() => {
    const list: Array<{ field: string; message: string }> = []
    if (!file.value) list.push({ field: 'file', message: 'Choose the CSV from the test stand.' })
    if (!fields.value.printer.trim()) list.push({ field: 'printer', message: 'Name the printer the part was printed on.' })
    if (!fields.value.material.trim()) list.push({ field: 'material', message: 'Name the material.' })
    return list
  })
  const showMissing = ref(false)

  /** Where the server found the first problem (row and column of the file, counted from 1). */
  const serverLocation = computed(() => serverProblemLocation(serverError.value?.details ?? null))

  async function send(): Promise<TestReportWithEntry | null> {
    showMissing.value = true
    if (missing.value.length || !file.value) return null
    sending.value = true
    serverError.value = null
    try {
      const body = reportFormData({
        ...fields.value,
        // columns by number: unambiguous whether or not the file has a header
        displacementColumn: String(displacementColumn.value + 1),
        forceColumn: String(forceColumn.value + 1),
        hasHeader: hasHeader.value,
      }, file.value, photo.value)
      return await reportsApi.upload(context.value.entryId, body)
    } catch (e) {
      serverError.value = asApiError(e)
      return null
    } finally {
      sending.value = false
    }
  }

  return {
    file, photo, preview, readError, hasHeader, displacementColumn, forceColumn, units, fields, sending, serverError, serverLocation,
    problem, curve, columnOptions, missing, showMissing, reset, send,
  }
}
