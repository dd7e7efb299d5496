/**
 * Types the models share, kept apart from the model classes so that a model that only refers
 * to another's key (an entry's revisions and reports point at the entry) imports no model.
 */

/**
 * draft → in_review → released → retired; a review may send it back to draft or reject it.
 * A change proposal (proposalForId set) that is released becomes the next revision of the
 * entry it proposes for and is itself marked merged.
 */
export const ENTRY_STATUSES = ['draft', 'in_review', 'released', 'retired', 'rejected', 'merged'] as const
export type EntryStatus = (typeof ENTRY_STATUSES)[number]

export type ParamValues = Record<string, number | string>
export type ParamRanges = Record<string, [number, number]>

/** Primary keys (integers, auto-incremented). */
export type EntryId = number
export type RevisionId = number
