import { computed, onMounted, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, asApiError } from '@/api'
import { curationApi, type EntryDetail, type EntryDiff, type ReviewQueue } from '@/api/curation'
import { useReferenceStore } from '@/stores/reference'
import { useReviewStore } from '@/stores/review'
import { changeCount } from './diff'
import type { OverlayCurve } from './curveOverlay'
import { useEntryComments } from './useEntryComments'


/** The curves of a proposal's review: the current revision (if any) under the proposed curve. */
export function reviewCurves(diff: Pick<EntryDiff, 'curves' | 'against'> | null): OverlayCurve[] {
  if (!diff) return []
  const out: OverlayCurve[] = []
  if (diff.curves.a) out.push({ id: 'current', label: `Current, revision ${diff.against?.number ?? ''}`.trim(), role: 'before', curve: diff.curves.a })
  if (diff.curves.b) out.push({ id: 'proposed', label: 'Proposed', role: 'after', curve: diff.curves.b })
  return out
}

/** How many proposals and reports one page of the review queue holds (the API allows up to 100). */
export const REVIEW_PAGE_SIZE = 50

/** Which rows of a paged list a page shows, and whether there is anything before or after it. */
export function queuePageSpan(offset: number, limit: number, total: number) {
  // first is 0 when the page holds none of the list (empty, or every row is on an earlier page)
  const first = offset < total ? offset + 1 : 0
  const last = first ? Math.min(offset + limit, total) : 0
  return { first, last, total, hasPrevious: offset > 0, hasNext: offset + limit < total }
}

/** What waits for a librarian: proposals in review and submitted test reports, a page at a time. */
export function useReviewQueue(pageSize = REVIEW_PAGE_SIZE) {
  const reviewStore = useReviewStore()
  const reference = useReferenceStore()
  const queue = shallowRef<ReviewQueue>({ entries: [], reports: [], page: { limit: 0, offset: 0, totalEntries: 0, totalReports: 0 } })
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)

  const offset = ref(0)

  async function load() {
    loading.value = true
    error.value = null
    try {
      const [q] = await Promise.all([curationApi.reviewQueue({ limit: pageSize, offset: offset.value }), reference.load()])
      queue.value = q
      reviewStore.set(q.page ? q.page.totalEntries + q.page.totalReports : q.entries.length + q.reports.length)
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const proposals = computed(() => queue.value.entries.map(({ entry, diff }) => ({
    ...entry,
    changes: changeCount(diff) + diff.fields.filter((f) => f.changed).length,
    isChange: !!entry.proposalForId,
    evaluationProblem: diff.evaluationProblem,
  })))

  // The API pages proposals and reports with one offset, so the pager moves both lists together
  // and stays while either list has more rows.
  const total = computed(() => Math.max(queue.value.page?.totalEntries ?? 0, queue.value.page?.totalReports ?? 0))
  const span = computed(() => queuePageSpan(offset.value, pageSize, total.value))
  const proposalSpan = computed(() => queuePageSpan(offset.value, pageSize, queue.value.page?.totalEntries ?? queue.value.entries.length))
  const reportSpan = computed(() => queuePageSpan(offset.value, pageSize, queue.value.page?.totalReports ?? queue.value.reports.length))
  function goTo(direction: 1 | -1) {
    const next = offset.value + direction * pageSize
    if (next < 0 || (direction > 0 && !span.value.hasNext)) return
    offset.value = next
    void load()
  }

  onMounted(load)
  return { queue, proposals, reports: computed(() => queue.value.reports), loading, error, load, span, proposalSpan, reportSpan, next: () => goTo(1), previous: () => goTo(-1) }
}

/** One proposal under review: the entry, its diff against the current revision, comments and decisions. */
export function useReviewEntry(id: Ref<number>) {
  const reference = useReferenceStore()
  const reviewStore = useReviewStore()
  const entry = shallowRef<EntryDetail | null>(null)
  const diff = shallowRef<EntryDiff | null>(null)
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)
  const acting = ref(false)

  async function load() {
    loading.value = true
    error.value = null
    try {
      const [e, d] = await Promise.all([curationApi.show(id.value), curationApi.diff(id.value), reference.load()])
      entry.value = e
      diff.value = d
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const family = computed(() => (entry.value ? reference.family(entry.value.familyId) ?? null : null))
  const curves = computed(() => reviewCurves(diff.value))
  const materialName = (mid: string) => reference.materials.find((m) => m.id === mid)?.name ?? mid

  /** Runs a decision; answers true when the server took it (so a dialog may close). */
  async function decide(run: () => Promise<EntryDetail>): Promise<{ ok: true; entry: EntryDetail } | { ok: false; error: ApiError }> {
    acting.value = true
    try {
      const updated = await run()
      entry.value = { ...updated, comments: updated.comments ?? entry.value?.comments ?? [] }
      reviewStore.refresh()
      return { ok: true, entry: updated }
    } catch (e) {
      return { ok: false, error: asApiError(e) }
    } finally {
      acting.value = false
    }
  }

  const release = () => decide(() => curationApi.release(id.value))
  const reject = (reason: string) => decide(() => curationApi.reject(id.value, reason))
  const requestChanges = (comment: string) => decide(() => curationApi.requestChanges(id.value, comment))

  const { posting, commentError, comment } = useEntryComments(entry)

  watch(id, load, { immediate: true })
  return { entry, diff, family, curves, loading, error, acting, posting, commentError, load, release, reject, requestChanges, comment, materialName }
}
