import { computed, onMounted, ref, shallowRef } from 'vue'
import { ApiError, entriesApi, asApiError } from '@/api'
import { curationApi, type EntryComment, type ProposalSummary } from '@/api/curation'
import type { EntryStatus } from '@/api/types'
import { useSessionStore } from '@/stores/session'

export interface ProposalRow extends ProposalSummary {
  /** The released entry a change proposal is for, by name. */
  changeFor: { id: number; name: string } | null
  /** The librarian's latest request for changes (drafts) or reason (rejected). */
  lastDecision: EntryComment | null
}

/** The order of the list: what needs the contributor first, then what waits, then the record. */
const proposalStatusOrder: EntryStatus[] = ['draft', 'in_review', 'rejected', 'released', 'retired', 'merged']

export function sortProposals<T extends Pick<ProposalSummary, 'status' | 'updatedAt'>>(rows: readonly T[]): T[] {
  return [...rows].sort((a, b) => proposalStatusOrder.indexOf(a.status) - proposalStatusOrder.indexOf(b.status) || b.updatedAt.localeCompare(a.updatedAt))
}

/** The signed-in contributor's drafts and proposals, with the librarian's latest word on each. */
export function useMyProposals() {
  const session = useSessionStore()
  const all = shallowRef<ProposalSummary[]>([])
  const decisions = shallowRef<Record<number, EntryComment | null>>({})
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)

  async function load() {
    loading.value = true
    error.value = null
    try {
      const entries = (await entriesApi.list()) as ProposalSummary[]
      all.value = entries
      const mine = entries.filter((e) => e.owner?.id === session.user?.id && (e.status === 'draft' || e.status === 'rejected'))
      const details = await Promise.all(mine.map((e) => curationApi.show(e.id).catch(() => null)))
      const next: Record<number, EntryComment | null> = {}
      for (const d of details) {
        if (!d) continue
        const wanted = d.status === 'rejected' ? 'rejected' : 'changes_requested'
        next[d.id] = [...d.comments].reverse().find((c) => c.kind === wanted) ?? null
      }
      decisions.value = next
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const rows = computed<ProposalRow[]>(() => {
    const byId = new Map(all.value.map((e) => [e.id, e]))
    const mine = all.value.filter((e) => e.owner?.id === session.user?.id)
    return sortProposals(mine).map((e) => {
      const target = e.proposalForId ? byId.get(e.proposalForId) : undefined
      return {
        ...e,
        changeFor: e.proposalForId ? { id: e.proposalForId, name: target?.name ?? `entry ${e.proposalForId}` } : null,
        lastDecision: decisions.value[e.id] ?? null,
      }
    })
  })

  onMounted(load)
  return { rows, loading, error, load }
}
