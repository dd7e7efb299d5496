import { onMounted, ref, shallowRef, watch } from 'vue'
import { ApiError, asApiError, request, usersApi, type User } from '@/api'

export interface AuditEvent {
  id: number
  at: string
  actor: { id: number; displayName: string } | null
  action: string
  subjectType: string
  subjectId: string
  details: Record<string, unknown>
}

export interface AuditFilters {
  person: number | null
  action: string | null
  /** [from, to] as local-midnight timestamps of the date picker, or null. */
  range: [number, number] | null
}

const day = (t: number) => {
  const d = new Date(t)
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`
}

/** The filters as the query string of GET /api/audit and /api/audit/csv. */
export function auditQuery(f: AuditFilters): string {
  const q = new URLSearchParams()
  if (f.person !== null) q.set('person', String(f.person))
  if (f.action) q.set('action', f.action)
  if (f.range) {
    q.set('from', day(f.range[0]))
    q.set('to', day(f.range[1]))
  }
  const s = q.toString()
  return s ? `?${s}` : ''
}

/** Who did it, in words: a person, the command line, or nobody signed in (a reset request). */
export function actorLabel(e: AuditEvent): string {
  if (e.actor) return e.actor.displayName
  if (e.details.via === 'command line') return `command line${typeof e.details.by === 'string' ? ` (${e.details.by})` : ''}`
  if (e.details.via === 'single sign-on') return 'single sign-on'
  return 'not signed in'
}

/** The audit screen: filters, the filtered events, and the people and actions to filter by. */
export function useAuditLog() {
  const filters = ref<AuditFilters>({ person: null, action: null, range: null })
  const events = shallowRef<AuditEvent[]>([])
  const actions = shallowRef<string[]>([])
  const people = shallowRef<User[]>([])
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)

  async function load() {
    loading.value = true
    error.value = null
    try {
      const answer = await request<{ events: AuditEvent[]; actions: string[] }>('GET', `/api/audit${auditQuery(filters.value)}`)
      events.value = answer.events
      actions.value = answer.actions
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  watch(filters, load, { deep: true })
  onMounted(async () => {
    await load()
    try {
      people.value = await usersApi.list()
    } catch {
      // the person filter stays empty; the log itself loaded
    }
  })
  return { filters, events, actions, people, loading, error, load }
}
