/** The librarians' review queue: entries in review, oldest first, each with its diff. */
import type { AppContext } from '../../context'
import type { User } from '../../db'
import { showEntry } from '../entries'
import { diffOf } from './revision-diff'

/** One page of the entries in review (limit and offset from the route), with how many wait in all. */
export async function reviewQueueEntries(context: AppContext, viewer: User, page: { limit: number; offset: number } = { limit: 50, offset: 0 }) {
  const { Entry, User } = context.db.models
  const where = { status: 'in_review' as const }
  const [total, waiting] = await Promise.all([
    Entry.count({ where }),
    Entry.findAll({
      where,
      include: [{ model: User, as: 'owner', attributes: ['id', 'displayName'] }],
      order: [['updatedAt', 'ASC'], ['id', 'ASC']],
      limit: page.limit,
      offset: page.offset,
    }),
  ])
  const items = []
  for (const entry of waiting) {
    const diff = await diffOf(context, entry, undefined)
    // each entry page reads its reports' stored comparisons: linear in the reports
    const detail = await showEntry(context, viewer, entry.id)
    items.push({ entry: detail, diff })
  }
  return { total, items }
}
