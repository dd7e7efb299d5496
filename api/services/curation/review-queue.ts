/** The librarians' review queue: entries in review, oldest first, each with its diff. */
import type { AppContext } from '../../context'
import type { User } from '../../db'
import { showEntry } from '../entries'
import { diffOf } from './revision-diff'

export async function reviewQueueEntries(context: AppContext, viewer: User) {
  const { Entry, User } = context.db.models
  const waiting = await Entry.findAll({
    where: { status: 'in_review' },
    include: [{ model: User, as: 'owner', attributes: ['id', 'displayName'] }],
    order: [['updatedAt', 'ASC'], ['id', 'ASC']],
  })
  const out = []
  for (const entry of waiting) {
    const diff = await diffOf(context, entry, undefined)
    const detail = await showEntry(context, viewer, entry.id)
    out.push({ entry: detail, diff })
  }
  return out
}
