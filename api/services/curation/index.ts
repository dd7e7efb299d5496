/**
 * The curation workflow of entries (docs/api.md, "Curation"): contributors write drafts and
 * change proposals, librarians review them. Every state change is written with its audit
 * event in one transaction; e-mails go out after the commit.
 *
 *   draft ──submit──▶ in_review ──release──▶ released ──retire──▶ retired
 *     ▲                 │  │
 *     └─request-changes─┘  └─reject──▶ rejected
 *
 * A change proposal (proposalForId set) follows the same path; released, it becomes the
 * next revision of the entry it proposes for, and the proposal itself is marked merged.
 */
export { createDraft, createProposal, updateDraft } from './drafts'
export { addComment } from './comments'
export { changeStatus } from './workflow'
export { compareRevisions, entryDiff } from './revision-diff'

export { reviewQueueEntries } from './review-queue'
