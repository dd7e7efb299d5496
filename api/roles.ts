/** Roles rank engineer < contributor < librarian < admin; a right of one is a right of every higher one. */
export const ROLES = ['engineer', 'contributor', 'librarian', 'admin'] as const
export type Role = (typeof ROLES)[number]

/** The roles an admin may grant or revoke; admin itself is given out of band. */
export const ASSIGNABLE_ROLES = ['engineer', 'contributor', 'librarian'] as const

export function roleRank(role: Role): number {
  return ROLES.indexOf(role)
}

export function hasRole(role: Role, minimum: Role): boolean {
  return roleRank(role) >= roleRank(minimum)
}
