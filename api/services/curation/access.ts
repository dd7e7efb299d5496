/** Shared by the curation services: an entry the viewer may see, its owner, and words for its status. */
import { Op, type Transaction } from 'sequelize'
import type { AppContext } from '../../context'
import type { Entry, EntryStatus, User } from '../../db'
import { notFound } from '../../errors'
import { visibleTo } from '../entries'

export const STATUS_WORDS: Record<EntryStatus, string> = {
  draft: 'a draft', in_review: 'in review', released: 'released', retired: 'retired', rejected: 'rejected', merged: 'merged into the entry it proposed a change for',
}

export async function loadVisible(context: AppContext, viewer: User, id: number, transaction?: Transaction): Promise<Entry> {
  const entry = await context.db.models.Entry.findOne({ where: { [Op.and]: [{ id }, visibleTo(viewer)] }, transaction })
  if (!entry) throw notFound('entry')
  return entry
}

export async function ownerOf(context: AppContext, entry: Entry, transaction?: Transaction): Promise<User | null> {
  return context.db.models.User.findByPk(entry.ownerId, { transaction })
}

export const title = (entry: Entry) => `"${entry.name}" (entry ${entry.id})`
