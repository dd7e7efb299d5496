import { rmSync } from 'node:fs'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { builtinMaterials, evaluate, families } from '../../catalog'
import { createApp } from '../../api/app'
import type { AppContext } from '../../api/context'
import { openDatabase } from '../../api/db'
import { DEMO_PASSWORD, DEMO_SHELF, DEMO_USERS } from '../../api/db/demo-shelf'
import { seedDemoData, type SeedReport } from '../../api/db/seed'
import { fileStore } from '../../api/services/file-store'
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
      return { c, report: await seedDemoData(c, { activity: true }) }
    }
    const [a, b] = await Promise.all([start(), start()])
    expect(a.report.usersCreated + b.report.usersCreated).toBe(DEMO_USERS.length)
    expect(a.report.materialsCreated + b.report.materialsCreated).toBe(builtinMaterials.length)
    const { User, Material, Entry, EntryRevision } = a.c.db.models
    expect(await User.count()).toBe(DEMO_USERS.length)
    expect(await Material.count()).toBe(builtinMaterials.length)
    const expectedEntries = registeredOnShelf().reduce((n, id) => n + DEMO_SHELF[id].length, 0)
    expect(a.report.entriesCreated + b.report.entriesCreated).toBe(expectedEntries)
    expect(await Entry.count()).toBe(expectedEntries + 2) // and the two of the demo activity
    const activityEntries = 2 // demo-activity.ts: the proposal in review and the retired entry
    expect(await EntryRevision.count()).toBe(expectedEntries + activityEntries)
    // the demo's activity once too: both reports, each e-mail, both configurations
    const { TestReport, OutboxMessage, SavedConfiguration } = a.c.db.models
    expect(await TestReport.count()).toBe(2)
    expect(await SavedConfiguration.count()).toBe(2)
    const subjects = (await OutboxMessage.findAll()).map((m) => m.subject)
    expect(new Set(subjects).size).toBe(subjects.length)
    expect(a.report.activityCreated + b.report.activityCreated).toBeGreaterThan(0)
    expect(Math.min(a.report.activityCreated, b.report.activityCreated)).toBe(0)
  })
})

describe('the demo activity (a first start of the server)', () => {
  let dir: string
  let demo: AppContext
  let seeded: SeedReport
  beforeAll(async () => {
    dir = makeTempDir()
    const config = testConfig(dir)
    demo = { config, db: await openDatabase(config.databaseFile) }
    seeded = await seedDemoData(demo, { activity: true })
  })
  afterAll(async () => {
    await demo.db.close()
    rmSync(dir, { recursive: true, force: true })
  })

  it('shows every role\u2019s work: a proposal in review with its thread, a retired entry, reports, e-mails, saved and shared configurations', async () => {
    const { Entry, EntryComment, OutboxMessage, SavedConfiguration, TestReport } = demo.db.models
    expect(seeded.skipped).toEqual([])
    const proposal = (await Entry.findOne({ where: { status: 'in_review' } }))!
    expect(proposal.name).toMatch(/demo/)
    expect(await EntryComment.count({ where: { entryId: proposal.id } })).toBeGreaterThanOrEqual(2)
    expect(await Entry.count({ where: { status: 'retired' } })).toBe(1)
    const reports = await TestReport.findAll({ order: [['id', 'ASC']] })
    expect(reports.map((r) => r.status).sort()).toEqual(['accepted', 'submitted'])
    for (const r of reports) expect(r.notes).toMatch(/Demo data.*Not a measurement: this curve was generated from the model/)
    // stored under a key of the shape every upload gets (reports/ and 32 hex digits): the bucket
    // store refuses any other key, so a demo file named otherwise stopped a start on object storage
    for (const r of reports) expect(r.filePath).toMatch(/^reports\/[0-9a-f]{32}\.csv$/)
    const mails = await OutboxMessage.findAll()
    expect(mails.length).toBeGreaterThanOrEqual(4)
    for (const m of mails) expect(m.text).toContain('Demo data')
    expect(mails.map((m) => m.subject)).toEqual(expect.arrayContaining([expect.stringMatching(/waits for review/), expect.stringMatching(/was accepted/)]))
    const configurations = await SavedConfiguration.findAll()
    expect(configurations.length).toBe(2)
    expect(configurations.filter((c) => c.shareToken).length).toBe(1)
  })

  it('gives the accepted report a measured curve under the prediction and a fitted modulus near the printed one it was generated with', async () => {
    const { EntryRevision, Material, TestReport } = demo.db.models
    const accepted = (await TestReport.findOne({ where: { status: 'accepted' } }))!
    const revision = (await EntryRevision.findByPk(accepted.revisionId!))!
    const petg = (await Material.findByPk('petg'))!
    // generated at 88 % of the nominal modulus with 1.5 % noise (demo-activity.ts): force ∝ E for a
    // linear elastic beam (Timoshenko & Gere, Theory of Elastic Stability: every stiffness term carries E),
    // so a least-squares fit over the curve must find about 0.88 × E; the noise averages out over 121 points
    const fit = (accepted.comparison as { modulusFit: { modulus: number } }).modulusFit
    expect(fit.modulus / petg.modulus).toBeGreaterThan(0.85)
    expect(fit.modulus / petg.modulus).toBeLessThan(0.91)
    // the measured peak, read independently of the comparison code, lies under the predicted one
    const measuredPeak = Math.max(...accepted.measuredCurve.force.slice(0, 60))
    const predictedPeak = revision.metrics.peakForce as number
    expect(measuredPeak / predictedPeak).toBeGreaterThan(0.8)
    expect(measuredPeak / predictedPeak).toBeLessThan(0.97)
    // its file reads back as the same curve
    const csv = (await fileStore(demo.config).read(accepted.filePath))!.toString('utf8').trim().split('\n')
    expect(csv[0]).toBe('displacement_mm,force_N')
    expect(csv.length - 1).toBe(accepted.measuredCurve.displacement.length)
    expect(csv[1].split(',').map(Number)).toEqual([accepted.measuredCurve.displacement[0], accepted.measuredCurve.force[0]])
  })

  it('lists the proposal in the review queue and the waiting report beside it', async () => {
    const app = createApp(demo)
    const librarian = (await request(app).post('/api/auth/signin').send({ email: 'librarian@demo.flexshelf.test', password: DEMO_PASSWORD })).body.token
    const queue = await request(app).get('/api/review-queue').set('Authorization', `Bearer ${librarian}`).expect(200)
    expect(JSON.stringify(queue.body)).toContain('Softer return spring, status button G2 (demo proposal)')
    expect(queue.body.reports.map((r: { status: string }) => r.status)).toEqual(['submitted'])
  })

  it('adds nothing when run again', async () => {
    const count = async () => {
      const m = demo.db.models
      return [await m.Entry.count(), await m.EntryComment.count(), await m.TestReport.count(), await m.OutboxMessage.count(), await m.SavedConfiguration.count()]
    }
    const before = await count()
    const again = await seedDemoData(demo, { activity: true })
    expect(again).toMatchObject({ entriesCreated: 0, activityCreated: 0 })
    expect(await count()).toEqual(before)
  })
})
