/** Who may see what: pure rules used by the route guard and the nav bar. */
import type { Role } from '@/api/types'

export const roleOrder: readonly Role[] = ['engineer', 'contributor', 'librarian', 'admin']

/** A role opens everything a lower role may do (engineer < contributor < librarian < admin). */
export function hasRole(actual: Role | null | undefined, required: Role): boolean {
  if (!actual) return false
  return roleOrder.indexOf(actual) >= roleOrder.indexOf(required)
}

export interface RouteAccess {
  /** Lowest role that may open the route; absent means signed-in users only when not public. */
  role?: Role
  /** Open without signing in (the sign-in page). */
  public?: boolean
  /** Only for visitors who are not signed in; signed-in users go to the shelf. */
  guestOnly?: boolean
}

export type AccessDecision =
  | { kind: 'allow' }
  | { kind: 'sign-in'; redirect: string }
  | { kind: 'forbidden'; required: Role }
  | { kind: 'home' }

export function decideAccess(meta: RouteAccess, role: Role | null, fullPath: string): AccessDecision {
  if (meta.guestOnly && role) return { kind: 'home' }
  if (meta.public) return { kind: 'allow' }
  if (!role) return { kind: 'sign-in', redirect: fullPath }
  const required = meta.role ?? 'engineer'
  if (!hasRole(role, required)) return { kind: 'forbidden', required }
  return { kind: 'allow' }
}

/** Only same-site paths are followed after sign-in (never `//host` or `https://…`). */
export function safeRedirect(value: unknown, fallback = '/'): string {
  if (typeof value !== 'string') return fallback
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return fallback
  if (value.startsWith('/signin')) return fallback
  return value
}
