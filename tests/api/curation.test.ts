/**
 * The proposal → review → release loop for each role (docs/api.md, "Curation"): who may
 * do each step, what a refused step leaves (nothing changed), the revisions a release
 * creates, the audit trail and the notification e-mails.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { evaluate } from '../../catalog'
import type { Role } from '../../api/roles'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
const tokens = {} as Record<Role, string>

beforeAll(async () => {
  t = await startTestApp()
  for (const role of ['engineer', 'contributor', 'librarian', 'admin'] as Role[]) tokens[role] = await signInAs(t.app, role)
})
afterAll(() => t.close())

const as = (role: Role) => ({
  post: (path: string, body: object = {}) => request(t.app).post(path).set(bearer(tokens[role])).send(body),
  patch: (path: string, body: object) => request(t.app).patch(path).set(bearer(tokens[role])).send(body),
  get: (path: string) => request(t.app).get(path).set(bearer(tokens[role])),
})

const DRAFT = {
  family: 'bistable-beam',
  name: 'Lid switch, soil probe P3',
  summary: 'Bistable switch in the lid of the P3 soil probe.',
  tags: ['switch', 'P3'],
  defaultParams: { span: 50, apexHeight: 2, thickness: 0.7, depth: 6, material: 'petg' },
  ranges: { span: [40, 60], thickness: [0.6, 0.9] } as Record<string, [number, number]>,
  materials: ['petg'],
  notes: 'Print flat.',
}

/** Everything a refused step must leave alone. */
async function stateOf(entryId?: number) {
  const { AuditEvent, Entry, EntryComment, EntryRevision, OutboxMessage } = t.context.db.models
  const entry = entryId ? await Entry.findByPk(entryId) : null
  return {
    entry: entry ? { status: entry.status, name: entry.name, defaultParams: entry.defaultParams, ranges: entry.ranges, currentRevisionId: entry.currentRevisionId, updatedAt: entry.updatedAt.toISOString() } : null,
    entries: await Entry.count(),
    revisions: await EntryRevision.count(),
    comments: await EntryComment.count(),
    audit: await AuditEvent.count(),
    outbox: await OutboxMessage.count(),
  }
}

async function outboxSince(count: number) {
  const { OutboxMessage } = t.context.db.models
  return (await OutboxMessage.findAll({ order: [['id', 'ASC']] })).slice(count)
}

async function auditOf(entryId: number) {
  const events = await t.context.db.models.AuditEvent.findAll({ where: { subjectType: 'entry', subjectId: String(entryId) }, order: [['id', 'ASC']] })
  return events.map((e) => ({ action: e.action, from: e.details.from, to: e.details.to, actorId: e.actorId }))
}

async function userId(role: Role) {
  return (await t.context.db.models.User.findOne({ where: { email: demoEmail(role) } }))!.id
}

describe('POST /api/entries', () => {
  describe('as an engineer', () => {
    it('answers 403 and stores nothing', async () => {
      const before = await stateOf()
      const res = await as('engineer').post('/api/entries', DRAFT)
      expect(res.status).toBe(403)
      expect(await stateOf()).toEqual(before)
    })
  })

  describe('as a contributor with a valid draft', () => {
    it('answers 201 with a draft owned by the contributor, defaults filled in, and an audit event', async () => {
      const res = await as('contributor').post('/api/entries', DRAFT)
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      const entry = res.body.entry
      expect(entry).toMatchObject({ status: 'draft', name: DRAFT.name, familyId: 'bistable-beam', ranges: DRAFT.ranges, proposalForId: null, revisions: [], reports: [], comments: [], owner: { displayName: 'Bram Kettleby' } })
      // postLength was not given: the family default (0) is stored, so a diff sees every parameter
      expect(entry.defaultParams).toEqual({ ...DRAFT.defaultParams, postLength: 0, wideBeam: 'auto' })
      expect(await auditOf(entry.id)).toEqual([{ action: 'entry.created', from: null, to: 'draft', actorId: await userId('contributor') }])
    })
  })

  describe('with bad fields', () => {
    it('answers 400 naming each bad field and stores nothing', async () => {
      const before = await stateOf()
      const res = await as('contributor').post('/api/entries', {
        ...DRAFT,
        ranges: { span: [5, 60], thickness: [0.9, 0.6], twist: [0, 1] },
        defaultParams: { span: 50, apexHeight: 2, thickness: 1.2, depth: 6 },
        materials: ['petg', 'unobtainium'],
      })
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('validation_failed')
      const fields = res.body.error.details.issues.map((i: { field: string }) => i.field)
      // span: 5 mm is below the family's own 10 mm; thickness: min above max; twist: no such
      // parameter. The bad ranges are left out when the defaults are checked, so thickness
      // 1.2 mm passes (inside the family's 0.2–5 mm) and only the material is added.
      expect(fields).toEqual(['ranges.span', 'ranges.thickness', 'ranges.twist', 'materials.1'])
      expect(res.body.error.message).toContain("ranges.span: [5, 60] must lie inside the family's own range 10–150 mm")
      expect(await stateOf()).toEqual(before)
    })

    it('names a default parameter outside the draft\u2019s own ranges', async () => {
      const res = await as('contributor').post('/api/entries', { ...DRAFT, defaultParams: { ...DRAFT.defaultParams, thickness: 1.2 } })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'defaultParams.thickness', message: expect.stringContaining('at most 0.9 mm (allowed for this entry 0.6–0.9 mm)') }])
    })

    it('names an unknown family and a missing name', async () => {
      const unknown = await as('contributor').post('/api/entries', { ...DRAFT, family: 'wave-spring' })
      expect(unknown.status).toBe(400)
      expect(unknown.body.error.details.issues[0]).toMatchObject({ field: 'family', message: expect.stringContaining('unknown module family "wave-spring"') })
      const { name: _name, ...noName } = DRAFT
      const missing = await as('contributor').post('/api/entries', noName)
      expect(missing.body.error.details.issues).toEqual([{ field: 'name', message: 'name is required' }])
    })
  })
})

describe('the loop for a new entry: draft → review → released → retired', () => {
  let id: number
  beforeAll(async () => {
    id = (await as('contributor').post('/api/entries', { ...DRAFT, name: 'Loop switch' })).body.entry.id
  })

  it('lets only the owner edit the draft', async () => {
    const before = await stateOf(id)
    expect((await as('librarian').patch(`/api/entries/${id}`, { summary: 'changed by someone else' })).status).toBe(403)
    expect((await as('engineer').patch(`/api/entries/${id}`, { summary: 'x' })).status).toBe(403)
    expect(await stateOf(id)).toEqual(before)
    const res = await as('contributor').patch(`/api/entries/${id}`, { summary: 'Edited by its owner.' })
    expect(res.status).toBe(200)
    expect(res.body.entry.summary).toBe('Edited by its owner.')
  })

  it('refuses a family change on edit, naming the field', async () => {
    const res = await as('contributor').patch(`/api/entries/${id}`, { family: 'leaf-hinge' })
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues[0].field).toBe('family')
  })

  it('refuses release of a draft (409 naming the status) and changes nothing', async () => {
    const before = await stateOf(id)
    const res = await as('librarian').post(`/api/entries/${id}/release`)
    expect(res.status).toBe(409)
    expect(res.body.error.message).toBe('this entry is a draft; only an entry in review can be released')
    expect(await stateOf(id)).toEqual(before)
  })

  it('lets only the owner submit: a librarian gets 403, the owner moves it to in_review and the librarians are told', async () => {
    const before = await stateOf(id)
    expect((await as('librarian').post(`/api/entries/${id}/submit`)).status).toBe(403)
    expect(await stateOf(id)).toEqual(before)
    const res = await as('contributor').post(`/api/entries/${id}/submit`)
    expect(res.status).toBe(200)
    expect(res.body.entry.status).toBe('in_review')
    const sent = await outboxSince(before.outbox)
    expect(sent.map((m) => m.to)).toEqual([[demoEmail('librarian')]])
    expect(sent[0].subject).toContain('"Loop switch"')
    expect(sent[0].status).toBe('sent')
  })

  it('refuses edits while in review (409)', async () => {
    const res = await as('contributor').patch(`/api/entries/${id}`, { summary: 'sneaky' })
    expect(res.status).toBe(409)
    expect(res.body.error.message).toContain('this entry is in review')
  })

  it('refuses release by the contributor and changes nothing', async () => {
    const before = await stateOf(id)
    expect((await as('contributor').post(`/api/entries/${id}/release`)).status).toBe(403)
    expect(await stateOf(id)).toEqual(before)
  })

  it('shows the entry in the review queue with its computed curve and a diff with no revision', async () => {
    const res = await as('librarian').get('/api/review-queue')
    expect(res.status).toBe(200)
    const item = res.body.entries.find((e: { entry: { id: number } }) => e.entry.id === id)
    expect(item.diff.against).toBeNull()
    expect(item.diff.curves.b.displacement.length).toBeGreaterThan(10)
    expect(item.diff.params.find((p: { key: string }) => p.key === 'span')).toMatchObject({ a: null, b: 50, changed: true })
  })

  it('releases it as revision 1 with the curve and metrics the catalog computes at the defaults, and tells the owner', async () => {
    const before = await stateOf(id)
    const res = await as('librarian').post(`/api/entries/${id}/release`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const entry = res.body.entry
    expect(entry.status).toBe('released')
    expect(entry.revisions).toHaveLength(1)
    const expected = evaluate('bistable-beam', { ...DRAFT.defaultParams, postLength: 0 }, { ranges: DRAFT.ranges })
    expect(entry.revisions[0]).toMatchObject({ number: 1, method: 'nonlinear-fe', params: expected.params, metrics: expected.metrics, warnings: expected.warnings, createdBy: { displayName: 'Bram Kettleby' } })
    expect(entry.revisions[0].curve.force).toEqual(expected.curve.force)
    expect(entry.currentRevision).toMatchObject({ id: entry.revisions[0].id, number: 1 })
    const sent = await outboxSince(before.outbox)
    expect(sent.map((m) => m.to)).toEqual([[demoEmail('contributor')]])
    expect(sent[0].subject).toContain('was released')
  })

  it('answers 409 for a second release and keeps one revision', async () => {
    const before = await stateOf(id)
    const res = await as('admin').post(`/api/entries/${id}/release`)
    expect(res.status).toBe(409)
    expect(res.body.error.message).toBe('this entry is released; only an entry in review can be released')
    expect(await stateOf(id)).toEqual(before)
  })

  it('lets engineers read it now', async () => {
    expect((await as('engineer').get(`/api/entries/${id}`)).status).toBe(200)
  })

  it('refuses retirement by a contributor, retires it for a librarian; still readable, a second retire is 409', async () => {
    const before = await stateOf(id)
    expect((await as('contributor').post(`/api/entries/${id}/retire`)).status).toBe(403)
    expect(await stateOf(id)).toEqual(before)
    const res = await as('librarian').post(`/api/entries/${id}/retire`, { reason: 'replaced by the P4 lid' })
    expect(res.status).toBe(200)
    expect(res.body.entry.status).toBe('retired')
    expect(res.body.entry.comments.map((c: { text: string }) => c.text)).toEqual(['replaced by the P4 lid'])
    expect((await as('engineer').get(`/api/entries/${id}`)).body.entry.status).toBe('retired')
    const again = await as('librarian').post(`/api/entries/${id}/retire`)
    expect(again.status).toBe(409)
    expect(again.body.error.message).toBe('this entry is retired; only a released entry can be retired')
  })

  it('recorded every state change with who and from → to', async () => {
    const contributor = await userId('contributor')
    const librarian = await userId('librarian')
    expect(await auditOf(id)).toEqual([
      { action: 'entry.created', from: null, to: 'draft', actorId: contributor },
      { action: 'entry.updated', from: undefined, to: undefined, actorId: contributor },
      { action: 'entry.submitted', from: 'draft', to: 'in_review', actorId: contributor },
      { action: 'entry.released', from: 'in_review', to: 'released', actorId: librarian },
      { action: 'entry.retired', from: 'released', to: 'retired', actorId: librarian },
    ])
  })
})

describe('review decisions', () => {
  async function inReview(name: string): Promise<number> {
    const id = (await as('contributor').post('/api/entries', { ...DRAFT, name })).body.entry.id
    await as('contributor').post(`/api/entries/${id}/submit`).expect(200)
    return id
  }

  describe('POST /api/entries/:id/request-changes', () => {
    it('needs a comment, sends the entry back to draft with it, tells the owner; the owner may edit and resubmit', async () => {
      const id = await inReview('Sent back switch')
      const missing = await as('librarian').post(`/api/entries/${id}/request-changes`, {})
      expect(missing.status).toBe(400)
      expect(missing.body.error.details.issues).toEqual([{ field: 'comment', message: 'comment is required' }])
      const before = await stateOf(id)
      const res = await as('librarian').post(`/api/entries/${id}/request-changes`, { comment: 'Narrow the thickness range to 0.6–0.8 mm.' })
      expect(res.status).toBe(200)
      expect(res.body.entry.status).toBe('draft')
      expect(res.body.entry.comments).toEqual([expect.objectContaining({ kind: 'changes_requested', text: 'Narrow the thickness range to 0.6–0.8 mm.', author: expect.objectContaining({ displayName: 'Lio Fennick' }) })])
      const sent = await outboxSince(before.outbox)
      expect(sent.map((m) => m.to)).toEqual([[demoEmail('contributor')]])
      expect(sent[0].text).toContain('Narrow the thickness range')
      expect((await as('contributor').patch(`/api/entries/${id}`, { ranges: { thickness: [0.6, 0.8] } })).status).toBe(200)
      expect((await as('contributor').post(`/api/entries/${id}/submit`)).body.entry.status).toBe('in_review')
    })
  })

  describe('POST /api/entries/:id/reject', () => {
    it('needs a reason, rejects, tells the owner; a rejected entry cannot be submitted again', async () => {
      const id = await inReview('Rejected switch')
      expect((await as('librarian').post(`/api/entries/${id}/reject`, {})).status).toBe(400)
      expect((await as('contributor').post(`/api/entries/${id}/reject`, { reason: 'mine' })).status).toBe(403)
      const before = await stateOf(id)
      const res = await as('librarian').post(`/api/entries/${id}/reject`, { reason: 'Duplicates the S1 switch.' })
      expect(res.status).toBe(200)
      expect(res.body.entry.status).toBe('rejected')
      expect((await outboxSince(before.outbox)).map((m) => [m.to, m.subject])).toEqual([[[demoEmail('contributor')], expect.stringContaining('was rejected')]])
      const again = await as('contributor').post(`/api/entries/${id}/submit`)
      expect(again.status).toBe(409)
      expect(again.body.error.message).toBe('this entry is rejected; only a draft can be submitted for review')
    })
  })
})

describe('a change proposal to a released entry', () => {
  let targetId: number
  let proposalId: number
  let firstRevisionId: number

  beforeAll(async () => {
    const id = (await as('contributor').post('/api/entries', { ...DRAFT, name: 'Proposal target' })).body.entry.id
    await as('contributor').post(`/api/entries/${id}/submit`).expect(200)
    const released = await as('librarian').post(`/api/entries/${id}/release`).expect(200)
    targetId = id
    firstRevisionId = released.body.entry.revisions[0].id
  })

  it('is refused to an engineer and for an entry that is not released', async () => {
    const before = await stateOf(targetId)
    expect((await as('engineer').post(`/api/entries/${targetId}/proposals`, { notes: 'x' })).status).toBe(403)
    expect(await stateOf(targetId)).toEqual(before)
    const draft = (await as('contributor').post('/api/entries', { ...DRAFT, name: 'Not released' })).body.entry.id
    const res = await as('contributor').post(`/api/entries/${draft}/proposals`, {})
    expect(res.status).toBe(409)
    expect(res.body.error.message).toBe('this entry is a draft; changes can be proposed only to a released entry')
  })

  it('is a draft pointing at the entry, starting from its current content', async () => {
    const res = await as('contributor').post(`/api/entries/${targetId}/proposals`, { defaultParams: { ...DRAFT.defaultParams, thickness: 0.75 } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    proposalId = res.body.entry.id
    expect(res.body.entry).toMatchObject({ status: 'draft', proposalForId: targetId, name: 'Proposal target', ranges: DRAFT.ranges, proposalFor: { id: targetId, status: 'released' } })
    const target = (await as('contributor').get(`/api/entries/${targetId}`)).body.entry
    expect(target.proposals.map((p: { id: number }) => p.id)).toEqual([proposalId])
  })

  it('diffs against the current revision: the changed parameter and metrics', async () => {
    const res = await as('contributor').get(`/api/entries/${proposalId}/diff`)
    expect(res.status).toBe(200)
    const diff = res.body.diff
    expect(diff.against).toEqual({ id: firstRevisionId, number: 1, entryId: targetId })
    expect(diff.params.filter((p: { changed: boolean }) => p.changed)).toEqual([{ key: 'thickness', label: 'Beam thickness', unit: 'mm', a: 0.7, b: 0.75, changed: true }])
    const peak = diff.metrics.find((m: { key: string }) => m.key === 'peakForce')
    // a thicker beam snaps over at a higher force
    expect(peak.b).toBeGreaterThan(peak.a)
    expect(peak.difference).toBeCloseTo(peak.b - peak.a, 12)
    expect(diff.fields.find((f: { field: string }) => f.field === 'name')).toMatchObject({ changed: false })
    expect(diff.curves.a.force.length).toBeGreaterThan(10)
    expect(diff.curves.b.force.length).toBeGreaterThan(10)
  })

  it('answers 404 for a diff against a revision of another entry and 400 for a malformed one', async () => {
    expect((await as('contributor').get(`/api/entries/${proposalId}/diff?against=999999`)).status).toBe(404)
    const bad = await as('contributor').get(`/api/entries/${proposalId}/diff?against=first`)
    expect(bad.status).toBe(400)
    expect(bad.body.error.details.issues[0].field).toBe('against')
  })

  it('accepts comments from the contributor and the librarian, listed on the proposal', async () => {
    expect((await as('contributor').post(`/api/entries/${proposalId}/comments`, { text: 'Measured 0.75 mm walls on printer 2.' })).status).toBe(201)
    expect((await as('engineer').post(`/api/entries/${proposalId}/comments`, { text: 'x' })).status).toBe(403)
    expect((await as('contributor').post(`/api/entries/${proposalId}/comments`, { text: '' })).status).toBe(400)
    const entry = (await as('librarian').get(`/api/entries/${proposalId}`)).body.entry
    expect(entry.comments.map((c: { kind: string; text: string }) => [c.kind, c.text])).toEqual([['comment', 'Measured 0.75 mm walls on printer 2.']])
  })

  it('released, becomes revision 2 of the entry; the proposal is merged and no longer listed', async () => {
    await as('contributor').post(`/api/entries/${proposalId}/submit`).expect(200)
    const res = await as('librarian').post(`/api/entries/${proposalId}/release`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.entry.status).toBe('merged')
    const target = (await as('engineer').get(`/api/entries/${targetId}`)).body.entry
    expect(target.status).toBe('released')
    expect(target.revisions.map((r: { number: number }) => r.number)).toEqual([1, 2])
    expect(target.defaultParams.thickness).toBe(0.75)
    expect(target.currentRevision.number).toBe(2)
    expect(target.proposals).toEqual([])
    const listed = (await as('librarian').get('/api/entries')).body.entries.map((e: { id: number }) => e.id)
    expect(listed).toContain(targetId)
    expect(listed).not.toContain(proposalId)
    const actions = (await t.context.db.models.AuditEvent.findAll({ where: { subjectType: 'entry', subjectId: String(targetId) } })).map((e) => e.action)
    expect(actions).toContain('entry.revised')
  })

  it('compares the two revisions: parameters, ranges and both curves', async () => {
    const target = (await as('engineer').get(`/api/entries/${targetId}`)).body.entry
    const [r1, r2] = target.revisions
    const res = await as('engineer').get(`/api/entries/${targetId}/revisions/compare?a=${r1.id}&b=${r2.id}`)
    expect(res.status).toBe(200)
    const observed = res.body.comparison
    expect(observed.a.number).toBe(1)
    expect(observed.b.number).toBe(2)
    expect(observed.params.filter((p: { changed: boolean }) => p.changed).map((p: { key: string }) => p.key)).toEqual(['thickness'])
    expect(observed.ranges.every((r: { changed: boolean }) => !r.changed)).toBe(true)
    expect(observed.a.curve.force).not.toEqual(observed.b.curve.force)
    const missing = await as('engineer').get(`/api/entries/${targetId}/revisions/compare?a=${r1.id}`)
    expect(missing.status).toBe(400)
    expect(missing.body.error.details.issues[0].field).toBe('b')
  })
})

describe('GET /api/review-queue', () => {
  it('answers 403 to a contributor', async () => {
    expect((await as('contributor').get('/api/review-queue')).status).toBe(403)
  })
})
