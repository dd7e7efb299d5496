import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, asApiError } from '@/api'
import { reportsApi, type EntryDetail, type TestReport } from '@/api/curation'
import { calibrationSummary } from '@catalog/calibration'
import { useReferenceStore } from '@/stores/reference'
import { useReviewStore } from '@/stores/review'
import { useSessionStore } from '@/stores/session'
import { reportOverlayCurves } from './curveOverlay'

/** Saves a Blob under a name through a temporary link (the file routes need the bearer token, so a plain link cannot). */
function saveBlob(blob: Blob, name: string) {
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = name
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 10_000)
}

/** The measured curves of an entry: what is drawn, the calibration figures, and the librarian's decisions. */
export function useEntryReports(entry: Ref<EntryDetail | null>) {
  const session = useSessionStore()
  const reference = useReferenceStore()
  const reviewStore = useReviewStore()
  const reports = shallowRef<TestReport[]>([])
  const busyId = ref<number | null>(null)

  watch(entry, (e) => { reports.value = e?.reports ?? [] }, { immediate: true })

  const isLibrarian = computed(() => session.can('librarian'))
  const canUpload = computed(() => session.can('contributor') && entry.value?.status === 'released' && !!entry.value.currentRevision)
  const visible = computed(() => reports.value.filter((r) => r.status !== 'rejected' || isLibrarian.value || r.uploader?.id === session.user?.id))
  const curves = computed(() => reportOverlayCurves(entry.value?.revisions ?? [], reports.value, {
    // librarians see every report waiting for them; a contributor sees their own
    includePending: isLibrarian.value || ((r: TestReport) => r.uploader?.id === session.user?.id),
    currentRevisionId: entry.value?.currentRevision?.id ?? null,
  }))
  const hasMeasured = computed(() => curves.value.some((c) => c.role === 'measured' || c.role === 'pending'))
  const hasPending = computed(() => curves.value.some((c) => c.role === 'pending'))
  /** Fitted moduli of the accepted reports, per printer and material (catalog/calibration). */
  const calibration = computed(() => calibrationSummary(reports.value
    .filter((r) => r.status === 'accepted' && r.comparison?.modulusFit)
    .map((r) => ({ reportId: r.id, printer: r.printer, material: r.material, modulus: r.comparison!.modulusFit!.modulus }))))

  function replace(updated: TestReport) {
    reports.value = reports.value.map((r) => (r.id === updated.id ? updated : r))
  }

  function added(report: TestReport) {
    reports.value = [...reports.value.filter((r) => r.id !== report.id), report]
    reviewStore.refresh()
  }

  async function run<T>(id: number, action: () => Promise<T>): Promise<{ ok: true; value: T } | { ok: false; error: ApiError }> {
    busyId.value = id
    try {
      return { ok: true, value: await action() }
    } catch (e) {
      return { ok: false, error: asApiError(e) }
    } finally {
      busyId.value = null
    }
  }

  async function decide(report: TestReport, decision: 'accept' | 'reject', note: string) {
    const r = await run(report.id, () => (decision === 'accept' ? reportsApi.accept(report.id, note) : reportsApi.reject(report.id, note)))
    if (r.ok) {
      replace(r.value)
      reviewStore.refresh()
    }
    return r
  }

  async function adopt(report: TestReport) {
    const r = await run(report.id, () => reportsApi.adoptModulus(report.id))
    // the new material is offered at once in every material picker
    if (r.ok) reference.materials = [...reference.materials.filter((m) => m.id !== r.value.id), r.value]
    return r
  }

  async function download(report: TestReport) {
    const r = await run(report.id, () => reportsApi.file(report.id))
    if (r.ok) saveBlob(r.value, `flexshelf-report-${report.id}.csv`)
    return r
  }

  /** Replaces a report's drawing preview with its whole curve (the overlay then draws every point). */
  async function drawAllPoints(report: TestReport) {
    const r = await run(report.id, () => reportsApi.curve(report.id))
    if (r.ok) replace({ ...report, measuredCurve: r.value.measuredCurve })
    return r
  }

  async function photoUrl(report: TestReport) {
    const r = await run(report.id, () => reportsApi.photo(report.id))
    return r.ok ? { ok: true as const, url: URL.createObjectURL(r.value) } : r
  }

  return { reports, visible, curves, hasMeasured, hasPending, calibration, isLibrarian, canUpload, busyId, added, decide, adopt, download, drawAllPoints, photoUrl }
}
