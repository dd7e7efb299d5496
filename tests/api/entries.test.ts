import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { EntryStatus } from '../../api/db'
import type { Role } from '../../api/roles'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
const tokens = {} as Record<Role, string>
const ids = {} as Record<string, number>

const CURVE = { displacement: [0, 1, 2], force: [0, 1.5, 2.5], axes: { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } } }

beforeAll(async () => {
  t = await startTestApp()
  // the demo users stay; the demo shelf goes, so this file reasons about exactly its own entries
  const { Entry, EntryRevision, TestReport, User } = t.context.db.models
  await Entry.destroy({ where: {} })
  const user = async (role: Role) => (await User.findOne({ where: { email: demoEmail(role) } }))!
  const contributor = await user('contributor')
  const librarian = await user('librarian')
  const otherContributor = await User.create({ email: 'other.contributor@example.test', displayName: 'Pell Araway', role: 'contributor', passwordHash: 'x' })

  const make = async (name: string, status: EntryStatus, ownerId: number) => {
    const entry = await Entry.create({ familyId: 'bistable-beam', name, summary: `${name} summary`, tags: ['test'], status, defaultParams: { span: 40 }, ranges: { span: [30, 50] }, materials: ['petg'], notes: '', ownerId, currentRevisionId: null })
    ids[name] = entry.id
    return entry
  }
  const released = await make('A released switch', 'released', librarian.id)
  await make('B retired hinge', 'retired', librarian.id)
  await make('C contributor draft', 'draft', contributor.id)
  await make('D contributor in review', 'in_review', contributor.id)
  await make('E other contributor draft', 'draft', otherContributor.id)
  await make('F librarian draft', 'draft', librarian.id)

  const r1 = await EntryRevision.create({ entryId: released.id, number: 1, params: { span: 40 }, ranges: {}, method: 'closed-form', curve: CURVE, metrics: { peakForce: 2.5 }, warnings: [], createdById: librarian.id })
  const r2 = await EntryRevision.create({ entryId: released.id, number: 2, params: { span: 42 }, ranges: {}, method: 'closed-form', curve: CURVE, metrics: { peakForce: 2.4 }, warnings: ['thin'], createdById: librarian.id })
  await released.update({ currentRevisionId: r2.id })
  await TestReport.create({ entryId: released.id, revisionId: r1.id, uploaderId: contributor.id, reviewerId: librarian.id, filePath: 'reports/1.csv', originalName: 'stand-run-1.csv', photoPath: null, printer: 'Bench printer 2', material: 'PETG', lot: 'L-7', orientation: 'flat', testSpeed: 10, notes: 'first run', status: 'accepted', measuredCurve: { displacement: [0, 1], force: [0, 1.4] } })

  for (const role of ['engineer', 'contributor', 'librarian', 'admin'] as Role[]) tokens[role] = await signInAs(t.app, role)
})
afterAll(() => t.close())

async function listedNames(role: Role): Promise<string[]> {
  const res = await request(t.app).get('/api/entries').set(bearer(tokens[role]))
  expect(res.status).toBe(200)
  return res.body.entries.map((e: { name: string }) => e.name)
}

describe('GET /api/entries', () => {
  describe('as an engineer', () => {
    it('answers released and retired entries only', async () => {
      expect(await listedNames('engineer')).toEqual(['A released switch', 'B retired hinge'])
    })
  })

  describe('as a contributor', () => {
    it('also answers their own unreleased entries, not other people\u2019s', async () => {
      expect(await listedNames('contributor')).toEqual(['A released switch', 'B retired hinge', 'C contributor draft', 'D contributor in review'])
    })
  })

  describe('as a librarian', () => {
    it('answers every entry', async () => {
      expect(await listedNames('librarian')).toHaveLength(6)
    })
  })

  describe('as an admin', () => {
    it('answers every entry', async () => {
      expect(await listedNames('admin')).toHaveLength(6)
    })
  })

  describe('the summary of an entry', () => {
    it('carries the owner and the current revision with its metrics', async () => {
      const res = await request(t.app).get('/api/entries').set(bearer(tokens.engineer))
      const observed = res.body.entries[0]
      expect(observed).toMatchObject({
        id: ids['A released switch'], familyId: 'bistable-beam', name: 'A released switch', tags: ['test'], status: 'released',
        owner: { id: expect.any(Number), displayName: 'Lio Fennick' },
        currentRevision: { id: expect.any(Number), number: 2, metrics: { peakForce: 2.4 } },
        updatedAt: expect.any(String),
      })
      expect(observed).not.toHaveProperty('revisions')
    })
  })
})

describe('GET /api/entries/:id', () => {
  describe('as an engineer, for a released entry', () => {
    it('answers the entry with its revisions (oldest first) and test reports', async () => {
      const res = await request(t.app).get(`/api/entries/${ids['A released switch']}`).set(bearer(tokens.engineer))
      expect(res.status).toBe(200)
      const entry = res.body.entry
      expect(entry).toMatchObject({ defaultParams: { span: 40 }, ranges: { span: [30, 50] }, materials: ['petg'], notes: '' })
      expect(entry.revisions.map((r: { number: number }) => r.number)).toEqual([1, 2])
      expect(entry.revisions[1]).toMatchObject({ params: { span: 42 }, method: 'closed-form', curve: CURVE, warnings: ['thin'], createdBy: { displayName: 'Lio Fennick' } })
      expect(entry.reports).toHaveLength(1)
      expect(entry.reports[0]).toMatchObject({ status: 'accepted', originalName: 'stand-run-1.csv', hasPhoto: false, uploader: { displayName: 'Bram Kettleby' }, reviewer: { displayName: 'Lio Fennick' }, lot: 'L-7' })
      expect(entry.reports[0]).not.toHaveProperty('filePath')
    })
  })

  describe('as an engineer, for a draft', () => {
    it('answers 404, as if it did not exist', async () => {
      const res = await request(t.app).get(`/api/entries/${ids['C contributor draft']}`).set(bearer(tokens.engineer))
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
    })
  })

  describe('as a contributor', () => {
    it('answers their own draft and 404 for someone else\u2019s', async () => {
      expect((await request(t.app).get(`/api/entries/${ids['C contributor draft']}`).set(bearer(tokens.contributor))).status).toBe(200)
      expect((await request(t.app).get(`/api/entries/${ids['E other contributor draft']}`).set(bearer(tokens.contributor))).status).toBe(404)
    })
  })

  describe('as a librarian', () => {
    it('answers anyone\u2019s draft', async () => {
      expect((await request(t.app).get(`/api/entries/${ids['E other contributor draft']}`).set(bearer(tokens.librarian))).status).toBe(200)
    })
  })

  describe('for an id that does not exist or is not a number', () => {
    it('answers 404', async () => {
      expect((await request(t.app).get('/api/entries/987654').set(bearer(tokens.admin))).status).toBe(404)
      expect((await request(t.app).get('/api/entries/12abc').set(bearer(tokens.admin))).status).toBe(404)
    })
  })
})
