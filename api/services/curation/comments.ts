/** Comments on an entry's review thread. */
import type { AppContext } from '../../context'
import type { User } from '../../db'
import { bodySchema, parseBody, textField } from '../../validation'
import { recordAudit } from '../audit'
import { loadVisible } from './access'

const commentBody = bodySchema({ text: textField('text', 5000, { multiline: true }) })

export async function addComment(context: AppContext, actor: User, entryId: number, body: unknown) {
  const { text } = parseBody(commentBody, body)
  const comment = await context.db.write(async (transaction) => {
    const entry = await loadVisible(context, actor, entryId, transaction)
    const created = await context.db.models.EntryComment.create({ entryId: entry.id, authorId: actor.id, kind: 'comment', text }, { transaction })
    await recordAudit(context, transaction, { actorId: actor.id, action: 'entry.commented', subjectType: 'entry', subjectId: entry.id, details: { commentId: created.id } })
    return created
  })
  return { id: comment.id, kind: comment.kind, text: comment.text, author: { id: actor.id, displayName: actor.displayName }, createdAt: comment.createdAt.toISOString() }
}
