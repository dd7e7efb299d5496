/**
 * The curation workflow's state changes of entries (docs/api.md, "Curation"): contributors write drafts and
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
import type { Transaction } from 'sequelize'
import { evaluate, type Evaluation } from '../../../catalog'
import type { AppContext } from '../../context'
import type { Entry, EntryStatus, User } from '../../db'
import { conflict, forbidden, notFound } from '../../errors'
import { bodySchema, optionalTextField, parseBody, textField } from '../../validation'
import { recordAudit } from '../audit'
import { showEntry } from '../entries'
import { listMaterials } from '../materials'
import { librarianAddresses, notify, type Notice } from '../notifications'
import { loadVisible, ownerOf, STATUS_WORDS, title } from './access'
import { contentOf } from './drafts'

export type Action = 'submit' | 'release' | 'reject' | 'request-changes' | 'retire'

/** Which status each action needs and where it leads. */
const TRANSITIONS: Record<Action, { from: EntryStatus; to: EntryStatus; audit: string; needs: string }> = {
  submit: { from: 'draft', to: 'in_review', audit: 'entry.submitted', needs: 'only a draft can be submitted for review' },
  release: { from: 'in_review', to: 'released', audit: 'entry.released', needs: 'only an entry in review can be released' },
  reject: { from: 'in_review', to: 'rejected', audit: 'entry.rejected', needs: 'only an entry in review can be rejected' },
  'request-changes': { from: 'in_review', to: 'draft', audit: 'entry.changes_requested', needs: 'changes can be requested only while an entry is in review' },
  retire: { from: 'released', to: 'retired', audit: 'entry.retired', needs: 'only a released entry can be retired' },
}


function illegal(entry: Entry, action: Action): never {
  throw conflict(`this entry is ${STATUS_WORDS[entry.status]}; ${TRANSITIONS[action].needs}`, { status: entry.status, action })
}


const rejectBody = bodySchema({ reason: textField('reason', 5000, { multiline: true }) })
const requestChangesBody = bodySchema({ comment: textField('comment', 5000, { multiline: true }) })
const retireBody = bodySchema({ reason: optionalTextField('reason', 5000, { multiline: true }).optional() })
const emptyBody = bodySchema({})

/** The evaluation a release stores: the entry's defaults, its ranges, the curated materials, the family's default method. */
export async function evaluateDefaults(context: AppContext, entry: Pick<Entry, 'familyId' | 'defaultParams' | 'ranges'>): Promise<Evaluation> {
  const materials = await listMaterials(context)
  return evaluate(entry.familyId, entry.defaultParams, { ranges: entry.ranges, materials })
}

export async function changeStatus(context: AppContext, actor: User, id: number, action: Action, body: unknown) {
  const transition = TRANSITIONS[action]
  const input = action === 'reject' ? parseBody(rejectBody, body)
    : action === 'request-changes' ? parseBody(requestChangesBody, body)
      : action === 'retire' ? parseBody(retireBody, body)
        : parseBody(emptyBody, body)
  const message = 'reason' in input ? input.reason : 'comment' in input ? input.comment : undefined

  // the curve is computed before the write transaction, so the single writer never waits on a solver
  let evaluation: Evaluation | null = null
  if (action === 'release') {
    const entry = await loadVisible(context, actor, id)
    if (entry.status !== transition.from) illegal(entry, action)
    evaluation = await evaluateDefaults(context, entry)
  }

  const { Entry, EntryComment, EntryRevision } = context.db.models
  const notices: Notice[] = []
  await context.db.write(async (transaction) => {
    const entry = await loadVisible(context, actor, id, transaction)
    if (action === 'submit' && entry.ownerId !== actor.id) throw forbidden('only the owner can submit an entry for review')
    if (entry.status !== transition.from) illegal(entry, action)
    const from = entry.status
    let to = transition.to
    const details: Record<string, unknown> = { from, name: entry.name }

    if (action === 'release') {
      const target = entry.proposalForId ? await Entry.findByPk(entry.proposalForId, { transaction }) : entry
      if (!target) throw notFound('entry the proposal is for')
      if (target !== entry && target.status !== 'released') {
        throw conflict(`the entry this proposal changes is ${STATUS_WORDS[target.status]}; a proposal can be released only onto a released entry`, { status: target.status })
      }
      const last = (await EntryRevision.max('number', { where: { entryId: target.id }, transaction })) as number | null
      const revision = await EntryRevision.create({
        entryId: target.id, number: (last ?? 0) + 1, params: evaluation!.params, ranges: entry.ranges, method: evaluation!.method,
        curve: evaluation!.curve, metrics: evaluation!.metrics, warnings: evaluation!.warnings, createdById: entry.ownerId,
      }, { transaction })
      details.revisionId = revision.id
      details.revisionNumber = revision.number
      if (target !== entry) {
        const targetFrom = target.status
        await target.update({ ...contentOf(entry), defaultParams: evaluation!.params, currentRevisionId: revision.id }, { transaction })
        await recordAudit(context, transaction, {
          actorId: actor.id, action: 'entry.revised', subjectType: 'entry', subjectId: target.id,
          details: { from: targetFrom, to: targetFrom, proposalId: entry.id, revisionId: revision.id, revisionNumber: revision.number },
        })
        to = 'merged'
        details.proposalForId = target.id
        await entry.update({ status: to, currentRevisionId: revision.id }, { transaction })
      } else {
        await entry.update({ status: to, defaultParams: evaluation!.params, currentRevisionId: revision.id }, { transaction })
      }
    } else {
      await entry.update({ status: to }, { transaction })
    }
    if (message) {
      const kind = action === 'reject' ? 'rejected' : action === 'request-changes' ? 'changes_requested' : 'comment'
      await EntryComment.create({ entryId: entry.id, authorId: actor.id, kind, text: message }, { transaction })
      details.message = message
    }
    details.to = to
    await recordAudit(context, transaction, { actorId: actor.id, action: transition.audit, subjectType: 'entry', subjectId: entry.id, details })
    notices.push(...(await noticesFor(context, actor, entry, action, details, transaction)))
  })
  await notify(context, notices)
  return showEntry(context, actor, id)
}

async function noticesFor(context: AppContext, actor: User, entry: Entry, action: Action, details: Record<string, unknown>, transaction: Transaction): Promise<Notice[]> {
  const kind = entry.proposalForId ? 'change proposal' : 'entry'
  if (action === 'submit') {
    return [{
      to: await librarianAddresses(context),
      subject: `Flexshelf: ${kind} ${title(entry)} waits for review`,
      text: `${actor.displayName} submitted the ${kind} ${title(entry)} for review. It is in the review queue with its computed curve and the differences from the current revision.`,
    }]
  }
  const owner = await ownerOf(context, entry, transaction)
  if (!owner || owner.id === actor.id) return []
  const reason = typeof details.message === 'string' ? `\n\n${actor.displayName} wrote:\n${details.message}` : ''
  if (action === 'release') {
    return [{ to: [owner.email], subject: `Flexshelf: your ${kind} ${title(entry)} was released`, text: `Hello ${owner.displayName},\n\n${actor.displayName} released your ${kind} ${title(entry)} as revision ${details.revisionNumber}.` }]
  }
  if (action === 'reject') {
    return [{ to: [owner.email], subject: `Flexshelf: your ${kind} ${title(entry)} was rejected`, text: `Hello ${owner.displayName},\n\n${actor.displayName} rejected your ${kind} ${title(entry)}.${reason}` }]
  }
  if (action === 'request-changes') {
    return [{ to: [owner.email], subject: `Flexshelf: changes requested on ${title(entry)}`, text: `Hello ${owner.displayName},\n\n${actor.displayName} sent your ${kind} ${title(entry)} back to draft with a request for changes. Edit it and submit it again.${reason}` }]
  }
  return []
}
