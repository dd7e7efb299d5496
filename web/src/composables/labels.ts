/** Flexshelf's words for roles, statuses and kinds, in one place. */
import type { EntryStatus, ModuleKind, Role } from '@/api/types'

export const roleLabels: Record<Role, string> = {
  engineer: 'Engineer',
  contributor: 'Contributor',
  librarian: 'Librarian',
  admin: 'Admin',
}

/** "an engineer", "a librarian": a role as it reads in a sentence. */
export function roleInSentence(role: Role): string {
  const word = roleLabels[role].toLowerCase()
  return `${/^[aeiou]/.test(word) ? 'an' : 'a'} ${word}`
}

export const statusLabels: Record<EntryStatus, string> = {
  draft: 'Draft',
  in_review: 'In review',
  released: 'Released',
  retired: 'Retired',
  rejected: 'Rejected',
  merged: 'Merged',
}

export const kindLabels: Record<ModuleKind, string> = {
  bistable: 'Bistable',
  spring: 'Spring',
  guide: 'Guide',
  hinge: 'Hinge',
  latch: 'Latch',
}
