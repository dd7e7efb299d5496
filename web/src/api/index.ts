/** Resource functions, one per API route the web app uses (docs/api.md). */
import { request } from './client'
import type { Entry, EntrySummary, EvaluateRequest, Evaluation, Family, GrantableRole, Material, Session, SigninOptions, User } from './types'

export { ApiError, asApiError, isAbort, request, setAuthToken, setUnauthenticatedHandler } from './client'
export type { FieldIssue } from './client'
export type * from './types'
export { searchApi } from './search'
export type { SearchAnswer, SearchProgress, SearchResult, SearchTradeoffs, TradeoffPoint } from './search'

export const authApi = {
  signIn: (email: string, password: string) => request<Session>('POST', '/api/auth/signin', { body: { email, password } }),
  signUp: (email: string, password: string, displayName: string) =>
    request<Session>('POST', '/api/auth/signup', { body: { email, password, displayName } }),
  signOut: () => request<void>('POST', '/api/auth/signout'),
  me: () => request<{ user: User }>('GET', '/api/auth/me').then((r) => r.user),
  options: () => request<SigninOptions>('GET', '/api/auth/options'),
  /** Collects the session a single sign-on left in its hand-over cookie. */
  ssoSession: () => request<Session>('POST', '/api/auth/oidc/session'),
  changePassword: (currentPassword: string, newPassword: string) => request<void>('POST', '/api/auth/password', { body: { currentPassword, newPassword } }),
  requestReset: (email: string) => request<{ status: string; message: string }>('POST', '/api/auth/password-reset', { body: { email } }),
  confirmReset: (token: string, newPassword: string) => request<void>('POST', '/api/auth/password-reset/confirm', { body: { token, newPassword } }),
}

export const usersApi = {
  list: () => request<{ users: User[] }>('GET', '/api/users').then((r) => r.users),
  setRole: (id: number, role: GrantableRole) =>
    request<{ user: User }>('PATCH', `/api/users/${id}/role`, { body: { role } }).then((r) => r.user),
}

export const familiesApi = {
  list: () => request<{ families: Family[] }>('GET', '/api/families').then((r) => r.families),
  evaluate: (familyId: string, body: EvaluateRequest, signal?: AbortSignal) =>
    request<Evaluation>('POST', `/api/families/${encodeURIComponent(familyId)}/evaluate`, { body, signal }),
}

export const materialsApi = {
  list: () => request<{ materials: Material[] }>('GET', '/api/materials').then((r) => r.materials),
}

export const entriesApi = {
  list: () => request<{ entries: EntrySummary[] }>('GET', '/api/entries').then((r) => r.entries),
  show: (id: number | string) => request<{ entry: Entry }>('GET', `/api/entries/${encodeURIComponent(String(id))}`).then((r) => r.entry),
}
