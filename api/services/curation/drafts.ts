/** Drafts and change proposals: a contributor writes them; a released proposal becomes the next revision (workflow.ts). */
import type { AppContext } from '../../context'
import type { Entry, User } from '../../db'
import { conflict, forbidden } from '../../errors'
import { recordAudit } from '../audit'
import { checkDraft, parseChangeBody, parseCreateBody, type DraftContent } from '../entry-drafts'
import { showEntry } from '../entries'
import { listMaterials } from '../materials'
import { loadVisible, STATUS_WORDS } from './access'

/** POST /api/entries: a new draft owned by the caller. */
export async function createDraft(context: AppContext, actor: User, body: unknown) {
  const { familyId, content } = parseCreateBody(body)
  const materials = await listMaterials(context)
  const checked = checkDraft(familyId, content, materials)
  const entry = await context.db.write(async (transaction) => {
    const created = await context.db.models.Entry.create({
      familyId: checked.family.id, ...checked.content, status: 'draft', ownerId: actor.id, currentRevisionId: null, proposalForId: null,
    }, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: 'entry.created', subjectType: 'entry', subjectId: created.id,
      details: { from: null, to: 'draft', familyId: created.familyId, name: created.name },
    })
    return created
  })
  return showEntry(context, actor, entry.id)
}

/** A draft's content as the draft checks read it. */
export function contentOf(entry: Entry): DraftContent {
  return {
    name: entry.name, summary: entry.summary, tags: entry.tags, defaultParams: entry.defaultParams,
    ranges: entry.ranges, materials: entry.materials, notes: entry.notes,
  }
}

/** POST /api/entries/:id/proposals: a draft that, released, becomes the next revision of a released entry. */
export async function createProposal(context: AppContext, actor: User, targetId: number, body: unknown) {
  const changes = parseChangeBody(body, 'a change proposal')
  const target = await loadVisible(context, actor, targetId)
  if (target.status !== 'released') throw conflict(`this entry is ${STATUS_WORDS[target.status]}; changes can be proposed only to a released entry`, { status: target.status })
  const materials = await listMaterials(context)
  const checked = checkDraft(target.familyId, { ...contentOf(target), ...changes }, materials)
  const proposal = await context.db.write(async (transaction) => {
    const created = await context.db.models.Entry.create({
      familyId: target.familyId, ...checked.content, status: 'draft', ownerId: actor.id, currentRevisionId: null, proposalForId: target.id,
    }, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: 'entry.proposed', subjectType: 'entry', subjectId: created.id,
      details: { from: null, to: 'draft', proposalForId: target.id, name: created.name },
    })
    return created
  })
  return showEntry(context, actor, proposal.id)
}

/** PATCH /api/entries/:id: the owner edits a draft (also after changes were requested). */
export async function updateDraft(context: AppContext, actor: User, id: number, body: unknown) {
  const changes = parseChangeBody(body, 'an entry')
  const materials = await listMaterials(context)
  await context.db.write(async (transaction) => {
    const entry = await loadVisible(context, actor, id, transaction)
    if (entry.ownerId !== actor.id) throw forbidden('only the owner of a draft can edit it')
    if (entry.status !== 'draft') throw conflict(`this entry is ${STATUS_WORDS[entry.status]}; only a draft can be edited (released entries change through a proposal)`, { status: entry.status })
    const checked = checkDraft(entry.familyId, { ...contentOf(entry), ...changes }, materials)
    await entry.update(checked.content, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: 'entry.updated', subjectType: 'entry', subjectId: entry.id,
      details: { fields: Object.keys(changes) },
    })
  })
  return showEntry(context, actor, id)
}
