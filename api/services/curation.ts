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
import { Op, type Transaction } from 'sequelize'
import { z } from 'zod'
import { evaluate, families, type Evaluation } from '../../catalog'
import type { AppContext } from '../context'
import type { Entry, EntryStatus, User } from '../db'
import { conflict, forbidden, notFound, validationFailed } from '../errors'
import { bodySchema, parseBody, textField } from '../validation'
import { recordAudit } from './audit'
import { checkDraft, parseChangeBody, parseCreateBody, type DraftContent } from './entry-drafts'
import { showEntry, visibleTo } from './entries'
import { listMaterials } from './materials'
import { librarianAddresses, notify, type Notice } from './notifications'

type Action = 'submit' | 'release' | 'reject' | 'request-changes' | 'retire'

/** Which status each action needs and where it leads. */
const TRANSITIONS: Record<Action, { from: EntryStatus; to: EntryStatus; audit: string; needs: string }> = {
  submit: { from: 'draft', to: 'in_review', audit: 'entry.submitted', needs: 'only a draft can be submitted for review' },
  release: { from: 'in_review', to: 'released', audit: 'entry.released', needs: 'only an entry in review can be released' },
  reject: { from: 'in_review', to: 'rejected', audit: 'entry.rejected', needs: 'only an entry in review can be rejected' },
  'request-changes': { from: 'in_review', to: 'draft', audit: 'entry.changes_requested', needs: 'changes can be requested only while an entry is in review' },
  retire: { from: 'released', to: 'retired', audit: 'entry.retired', needs: 'only a released entry can be retired' },
}

const STATUS_WORDS: Record<EntryStatus, string> = {
  draft: 'a draft', in_review: 'in review', released: 'released', retired: 'retired', rejected: 'rejected', merged: 'merged into the entry it proposed a change for',
}

function illegal(entry: Entry, action: Action): never {
  throw conflict(`this entry is ${STATUS_WORDS[entry.status]}; ${TRANSITIONS[action].needs}`, { status: entry.status, action })
}

async function loadVisible(context: AppContext, viewer: User, id: number, transaction?: Transaction): Promise<Entry> {
  const entry = await context.db.models.Entry.findOne({ where: { [Op.and]: [{ id }, visibleTo(viewer)] }, transaction })
  if (!entry) throw notFound('entry')
  return entry
}

async function ownerOf(context: AppContext, entry: Entry, transaction?: Transaction): Promise<User | null> {
  return context.db.models.User.findByPk(entry.ownerId, { transaction })
}

const title = (entry: Entry) => `"${entry.name}" (entry ${entry.id})`

// ── drafts and proposals ─────────────────────────────────────────────────────────────

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

function contentOf(entry: Entry): DraftContent {
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

// ── comments ─────────────────────────────────────────────────────────────────────────

const commentBody = bodySchema({ text: textField('text', 5000) })

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

// ── state changes ────────────────────────────────────────────────────────────────────

const rejectBody = bodySchema({ reason: textField('reason', 5000) })
const requestChangesBody = bodySchema({ comment: textField('comment', 5000) })
const retireBody = bodySchema({ reason: z.string({ error: 'reason must be text' }).trim().max(5000, 'reason must be at most 5000 characters').optional() })
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

// ── diffs and comparisons ────────────────────────────────────────────────────────────

type Revisionish = { id: number; number: number; entryId: number; params: Record<string, unknown>; ranges: Record<string, [number, number]>; metrics: Record<string, unknown>; curve: unknown; method: string }

function sameValue(a: unknown, b: unknown): boolean {
  return JSON.stringify(a ?? null) === JSON.stringify(b ?? null)
}

function paramKeys(familyId: string, ...objects: Array<Record<string, unknown>>): string[] {
  const family = families.find((f) => f.id === familyId)
  const keys = family ? family.params.map((p) => p.key) : []
  for (const o of objects) for (const k of Object.keys(o)) if (!keys.includes(k)) keys.push(k)
  return keys
}

function metricSpecs(familyId: string) {
  return families.find((f) => f.id === familyId)?.metrics ?? []
}

/** Side-by-side rows of two snapshots: params, ranges and metrics, each with `changed`. */
export function sideBySide(familyId: string, left: { params: Record<string, unknown>; ranges: Record<string, unknown>; metrics: Record<string, unknown> }, right: typeof left) {
  const family = families.find((f) => f.id === familyId)
  const spec = (key: string) => family?.params.find((p) => p.key === key)
  const params = paramKeys(familyId, left.params, right.params).filter((k) => k in left.params || k in right.params).map((key) => ({
    key, label: spec(key)?.label ?? key, unit: spec(key)?.unit ?? '', a: left.params[key] ?? null, b: right.params[key] ?? null, changed: !sameValue(left.params[key], right.params[key]),
  }))
  const ranges = paramKeys(familyId, left.ranges, right.ranges).filter((k) => k in left.ranges || k in right.ranges).map((key) => ({
    key, label: spec(key)?.label ?? key, unit: spec(key)?.unit ?? '', a: left.ranges[key] ?? null, b: right.ranges[key] ?? null, changed: !sameValue(left.ranges[key], right.ranges[key]),
  }))
  const metricKeys = [...new Set([...metricSpecs(familyId).map((m) => m.key), ...Object.keys(left.metrics), ...Object.keys(right.metrics)])]
    .filter((k) => k in left.metrics || k in right.metrics)
  const metrics = metricKeys.map((key) => {
    const m = metricSpecs(familyId).find((s) => s.key === key)
    const a = left.metrics[key] ?? null
    const b = right.metrics[key] ?? null
    return { key, label: m?.label ?? key, unit: m?.unit ?? '', a, b, difference: typeof a === 'number' && typeof b === 'number' ? b - a : null, changed: !sameValue(a, b) }
  })
  return { params, ranges, metrics }
}

function revisionRef(r: Revisionish | null) {
  return r ? { id: r.id, number: r.number, entryId: r.entryId } : null
}

/** The entry as it would be released: a released entry's current revision, otherwise its defaults evaluated now. */
async function proposedSnapshot(context: AppContext, entry: Entry) {
  if ((entry.status === 'released' || entry.status === 'retired' || entry.status === 'merged') && entry.currentRevisionId) {
    const current = await context.db.models.EntryRevision.findByPk(entry.currentRevisionId)
    if (current) return { params: current.params, ranges: current.ranges, metrics: current.metrics, curve: current.curve, method: current.method, warnings: current.warnings, problem: null }
  }
  try {
    const evaluation = await evaluateDefaults(context, entry)
    return { params: evaluation.params, ranges: entry.ranges, metrics: evaluation.metrics, curve: evaluation.curve, method: evaluation.method, warnings: evaluation.warnings, problem: null }
  } catch (err) {
    return { params: entry.defaultParams, ranges: entry.ranges, metrics: {}, curve: null, method: null, warnings: [], problem: (err as Error).message }
  }
}

/**
 * The entry (a draft, a proposal or a released entry) against a revision: by default the
 * current revision of the entry it proposes for (or its own).
 */
export async function entryDiff(context: AppContext, viewer: User, id: number, againstRaw: unknown) {
  const entry = await loadVisible(context, viewer, id)
  return diffOf(context, entry, againstRaw)
}

async function diffOf(context: AppContext, entry: Entry, againstRaw: unknown) {
  const { Entry, EntryRevision } = context.db.models
  const baseId = entry.proposalForId ?? entry.id
  const base = entry.proposalForId ? await Entry.findByPk(entry.proposalForId) : entry
  let against: Revisionish | null = null
  if (againstRaw !== undefined && againstRaw !== '') {
    const revisionId = parseQueryId(againstRaw, 'against')
    against = await EntryRevision.findOne({ where: { id: revisionId, entryId: { [Op.in]: [entry.id, baseId] } } }) as Revisionish | null
    if (!against) throw notFound(`revision ${revisionId} of this entry`)
  } else if (base?.currentRevisionId) {
    against = await EntryRevision.findByPk(base.currentRevisionId) as Revisionish | null
  }
  const proposed = await proposedSnapshot(context, entry)
  const rows = sideBySide(entry.familyId, against ?? { params: {}, ranges: {}, metrics: {} }, proposed)
  const isCurrent = Boolean(against && base && against.id === base.currentRevisionId)
  const fieldNames = ['name', 'summary', 'tags', 'materials', 'notes'] as const
  return {
    entryId: entry.id,
    against: revisionRef(against),
    // a side is `a` (the revision) and `b` (this entry)
    ...rows,
    fields: isCurrent && base && base !== entry
      ? fieldNames.map((field) => ({ field, a: base[field], b: entry[field], changed: !sameValue(base[field], entry[field]) }))
      : [],
    curves: { a: against?.curve ?? null, b: proposed.curve },
    method: proposed.method,
    warnings: proposed.warnings,
    evaluationProblem: proposed.problem,
  }
}

export function parseQueryId(raw: unknown, field: string): number {
  const text = typeof raw === 'string' ? raw : ''
  const n = Number(text)
  if (!/^\d{1,15}$/.test(text) || !Number.isSafeInteger(n)) {
    throw validationFailed([{ field, message: `${field} must be a revision id (a whole number)` }])
  }
  return n
}

/** GET /api/entries/:id/revisions/compare?a=&b= */
export async function compareRevisions(context: AppContext, viewer: User, id: number, query: Record<string, unknown>) {
  const entry = await loadVisible(context, viewer, id)
  const a = parseQueryId(query.a, 'a')
  const b = parseQueryId(query.b, 'b')
  const detail = await showEntry(context, viewer, entry.id)
  const ra = detail.revisions.find((r) => r.id === a)
  const rb = detail.revisions.find((r) => r.id === b)
  if (!ra) throw notFound(`revision ${a} of this entry`)
  if (!rb) throw notFound(`revision ${b} of this entry`)
  return { entryId: entry.id, a: ra, b: rb, ...sideBySide(entry.familyId, ra, rb) }
}

// ── review queue ─────────────────────────────────────────────────────────────────────

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
