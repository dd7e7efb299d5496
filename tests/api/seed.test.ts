import { rmSync } from 'node:fs'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { builtinMaterials, evaluate, families } from '../../catalog'
import { createApp } from '../../api/app'
import type { AppContext } from '../../api/context'
import { openDatabase } from '../../api/db'
import { DEMO_PASSWORD, DEMO_SHELF, DEMO_USERS } from '../../api/db/demo-shelf'
import { seedDemoData, type SeedReport } from '../../api/db/seed'
import { makeTempDir, onPostgres, testConfig } from './helpers'

const SHELF_FAMILIES = ['bistable-beam', 'leaf-hinge', 'notch-hinge', 'parallel-guide', 'serpentine-spring', 'snap-hook']
const registeredOnShelf = () => Object.keys(DEMO_SHELF).filter((id) => families.some((f) => f.id === id))

let dataDir: string
let context: AppContext
let first: SeedReport
beforeAll(async () => {
  dataDir = makeTempDir()
  const config = testConfig(dataDir)
  context = { config, db: await openDatabase(config.databaseFile) }
  first = await seedDemoData(context)
})
afterAll(async () => {
  await context.db.close()
  rmSync(dataDir, { recursive: true, force: true })
})

/** Row count and newest updatedAt of every table, plus every row's updatedAt. */
async function databaseState() {
  const { User, Material, Entry, EntryRevision, TestReport, SavedConfiguration, AuditEvent } = context.db.models
  const stamps = async (model: typeof User | typeof Material | typeof Entry) =>
    (await (model as typeof User).findAll({ order: [['createdAt', 'ASC']] })).map((r) => `${r.get('id')}@${(r.get('updatedAt') as Date).toISOString()}`)
  return {
    users: await stamps(User),
    materials: await stamps(Material),
    entries: await stamps(Entry),
    revisions: await EntryRevision.count(),
    reports: await TestReport.count(),
    configurations: await SavedConfiguration.count(),
    auditEvents: await AuditEvent.count(),
  }
}

describe('the demo shelf definition', () => {
  it('has at least two bistable-beam entries and one for each other family', () => {
    expect(DEMO_SHELF['bistable-beam'].length).toBeGreaterThanOrEqual(2)
    for (const id of SHELF_FAMILIES) expect(DEMO_SHELF[id]?.length ?? 0, id).toBeGreaterThanOrEqual(1)
  })

  it('has one draft, owned by the contributor', () => {
    const drafts = Object.values(DEMO_SHELF).flat().filter((e) => e.status === 'draft')
    expect(drafts.map((d) => d.owner)).toEqual(['contributor@demo.flexshelf.test'])
  })

  it('uses the demo e-mail addresses of issue 2', () => {
    expect(DEMO_USERS.map((u) => [u.email, u.role])).toEqual([
      ['engineer@demo.flexshelf.test', 'engineer'],
      ['contributor@demo.flexshelf.test', 'contributor'],
      ['librarian@demo.flexshelf.test', 'librarian'],
      ['admin@demo.flexshelf.test', 'admin'],
    ])
    expect(DEMO_PASSWORD).toBe('flexshelf-demo')
  })
})

describe('seedDemoData', () => {
  describe('on an empty database', () => {
    it('creates the four demo users, the built-in materials and an entry per demo definition of each registered family', () => {
      const expectedEntries = registeredOnShelf().reduce((n, id) => n + DEMO_SHELF[id].length, 0)
      expect(registeredOnShelf().length).toBeGreaterThan(0)
      expect(first).toMatchObject({ usersCreated: 4, materialsCreated: builtinMaterials.length, entriesCreated: expectedEntries, skipped: [] })
      expect(first.familiesPending).toEqual(Object.keys(DEMO_SHELF).filter((id) => !registeredOnShelf().includes(id)))
    })

    it('lets each demo user sign in with the demo password in their role', async () => {
      const app = createApp(context)
      for (const demo of DEMO_USERS) {
        const res = await request(app).post('/api/auth/signin').send({ email: demo.email, password: DEMO_PASSWORD })
        expect(res.status, demo.email).toBe(200)
        expect(res.body.user.role).toBe(demo.role)
      }
    })

    it('stores the built-in materials with the sources of their numbers', async () => {
      const stored = await context.db.models.Material.findAll({ order: [['id', 'ASC']] })
      expect(stored.map((m) => m.id)).toEqual(builtinMaterials.map((m) => m.id).sort())
      for (const m of stored) {
        const builtin = builtinMaterials.find((b) => b.id === m.id)!
        expect({ modulus: m.modulus, strainLimit: m.strainLimit, source: m.source }).toEqual({ modulus: builtin.modulus, strainLimit: builtin.strainLimit, source: builtin.source })
        expect(m.source).toMatch(/[Mm]odulus/)
      }
    })

    it('stores revision 1 of each entry with the curve, metrics and warnings evaluated at its defaults', async () => {
      const { Entry, EntryRevision } = context.db.models
      const entries = await Entry.findAll()
      expect(entries.length).toBe(first.entriesCreated)
      for (const entry of entries) {
        const revisions = await EntryRevision.findAll({ where: { entryId: entry.id } })
        expect(revisions.map((r) => r.number), entry.name).toEqual([1])
        const [revision] = revisions
        expect(entry.currentRevisionId).toBe(revision.id)
        const expected = JSON.parse(JSON.stringify(evaluate(entry.familyId, entry.defaultParams)))
        expect(revision.method).toBe(expected.method)
        expect(revision.curve).toEqual(expected.curve)
        expect(revision.metrics).toEqual(expected.metrics)
        expect(revision.warnings).toEqual(expected.warnings)
      }
    })

    it('keeps every allowed range inside the family\u2019s schema, around the defaults', async () => {
      for (const entry of await context.db.models.Entry.findAll()) {
        const family = families.find((f) => f.id === entry.familyId)!
        for (const [key, [lo, hi]] of Object.entries(entry.ranges)) {
          const spec = family.params.find((p) => p.key === key)!
          expect(lo, `${entry.name} ${key}`).toBeGreaterThanOrEqual(spec.min)
          expect(hi, `${entry.name} ${key}`).toBeLessThanOrEqual(spec.max)
          expect(entry.defaultParams[key] as number).toBeGreaterThanOrEqual(lo)
          expect(entry.defaultParams[key] as number).toBeLessThanOrEqual(hi)
        }
      }
    })

    it('releases only modules that pass their own checks at the defaults (strain safety, bistability)', async () => {
      const { Entry, EntryRevision } = context.db.models
      for (const entry of await Entry.findAll({ where: { status: 'released' } })) {
        const revision = (await EntryRevision.findByPk(entry.currentRevisionId!))!
        const safety = revision.metrics.safetyFactor
        if (typeof safety === 'number') expect(safety, entry.name).toBeGreaterThanOrEqual(1 - 1e-9)
        if (entry.familyId === 'bistable-beam') expect(revision.metrics.bistable, entry.name).toBe(true)
      }
    })

    it('releases the librarian\u2019s entries and lists the entry materials among the stored ones', async () => {
      const { Entry, Material, User } = context.db.models
      const librarian = (await User.findOne({ where: { email: 'librarian@demo.flexshelf.test' } }))!
      const known = new Set((await Material.findAll()).map((m) => m.id))
      for (const entry of await Entry.findAll()) {
        if (entry.ownerId === librarian.id) expect(entry.status, entry.name).toBe('released')
        for (const id of entry.materials) expect(known.has(id), `${entry.name}: ${id}`).toBe(true)
      }
    })
  })

  describe('run a second time', () => {
    it('changes nothing: same rows, same updatedAt', async () => {
      const before = await databaseState()
      const again = await seedDemoData(context)
      expect(again).toMatchObject({ usersCreated: 0, materialsCreated: 0, entriesCreated: 0, skipped: [] })
      expect(await databaseState()).toEqual(before)
    })
  })

  describe('after a librarian edits a seeded material', () => {
    it('keeps the edit', async () => {
      await context.db.models.Material.update({ modulus: 1900, notes: 'calibrated on bench printer 2' }, { where: { id: 'petg' } })
      await seedDemoData(context)
      const petg = (await context.db.models.Material.findByPk('petg'))!
      expect({ modulus: petg.modulus, notes: petg.notes }).toEqual({ modulus: 1900, notes: 'calibrated on bench printer 2' })
    })
  })

  describe('when families are registered after the first run', () => {
    let dir: string
    let later: AppContext
    beforeAll(async () => {
      dir = makeTempDir()
      const config = testConfig(dir)
      later = { config, db: await openDatabase(config.databaseFile) }
    })
    afterAll(async () => {
      await later.db.close()
      rmSync(dir, { recursive: true, force: true })
    })

    it('adds their entries on the next run, and nothing on the one after', async () => {
      const [firstFamily, ...rest] = registeredOnShelf()
      expect(rest.length).toBeGreaterThan(0)
      const early = await seedDemoData(later, { registeredFamilies: [firstFamily] })
      expect(early.entriesCreated).toBe(DEMO_SHELF[firstFamily].length)
      expect(early.familiesPending).toEqual(expect.arrayContaining(rest))

      const next = await seedDemoData(later)
      expect(next.usersCreated).toBe(0)
      expect(next.entriesCreated).toBe(rest.reduce((n, id) => n + DEMO_SHELF[id].length, 0))

      const count = await later.db.models.Entry.count()
      const last = await seedDemoData(later)
      expect(last.entriesCreated).toBe(0)
      expect(await later.db.models.Entry.count()).toBe(count)
    })
  })
})

// Two instances starting together share one PostgreSQL database (SQLite has one server
// process per file, so this is PostgreSQL's case): both migrate and seed at the same moment.
describe.runIf(onPostgres)('two instances starting at the same moment on one database', () => {
  let dir: string
  const opened: AppContext[] = []
  afterAll(async () => {
    for (const c of opened) await c.db.close()
    rmSync(dir, { recursive: true, force: true })
  })

  it('migrate once and seed once: every demo record exists exactly once', async () => {
    dir = makeTempDir()
    const config = testConfig(dir)
    const start = async () => {
      const c: AppContext = { config, db: await openDatabase(config.databaseFile) }
      opened.push(c)
      return { c, report: await seedDemoData(c) }
    }
    const [a, b] = await Promise.all([start(), start()])
    expect(a.report.usersCreated + b.report.usersCreated).toBe(DEMO_USERS.length)
    expect(a.report.materialsCreated + b.report.materialsCreated).toBe(builtinMaterials.length)
    const { User, Material, Entry, EntryRevision } = a.c.db.models
    expect(await User.count()).toBe(DEMO_USERS.length)
    expect(await Material.count()).toBe(builtinMaterials.length)
    const expectedEntries = registeredOnShelf().reduce((n, id) => n + DEMO_SHELF[id].length, 0)
    expect(a.report.entriesCreated + b.report.entriesCreated).toBe(expectedEntries)
    expect(await Entry.count()).toBe(expectedEntries)
    expect(await EntryRevision.count()).toBe(expectedEntries)
  })
})
