/**
 * Demo data: one user per role, the built-in materials and the demo shelf. Idempotent:
 * a record that exists is left as it is (a librarian's edits survive a restart), and a
 * family registered since the last run gets its entries on the next one.
 */
import type { Transaction } from 'sequelize'
import { builtinMaterials, evaluate, families, type ParamRanges } from '../../catalog'
import type { AppContext } from '../context'
import { withAdvisoryLock } from './migrate'
import { hashPassword } from '../services/auth'
import { DEMO_PASSWORD, DEMO_SHELF, DEMO_USERS, type DemoEntry } from './demo-shelf'
import { DEMO_ACTIVITY_ENTRIES, DEMO_CONFIGURATIONS, DEMO_MARK, DEMO_REPORTS, generatedNote, type DemoActivityEntry, type DemoReport } from './demo-activity'
import { measurementCsv, syntheticMeasurement } from './demo-measurement'
import type { Entry, EntryRevision } from './models'
import type { MeasuredCurve } from './models/test-report'
import { fileStore } from '../services/file-store'
import { compareReport } from '../services/report-comparison'
import { newShareToken } from '../services/configurations'

export interface SeedReport {
  usersCreated: number
  materialsCreated: number
  entriesCreated: number
  /** Records of the demo's activity added (entries, comments, reports, e-mails, configurations). */
  activityCreated: number
  /** Demo entries of registered families that could not be seeded, and why. */
  skipped: Array<{ familyId: string; name: string; reason: string }>
  /** Families on the demo shelf that the catalog does not register yet. */
  familiesPending: string[]
}

/** The demo ranges narrowed to the family's own limits (the catalog refuses anything wider). */
function rangesInsideFamily(familyId: string, ranges: ParamRanges): { ranges: ParamRanges; problems: string[] } {
  const family = families.find((f) => f.id === familyId)!
  const inside: ParamRanges = {}
  const problems: string[] = []
  for (const [key, [lo, hi]] of Object.entries(ranges)) {
    const spec = family.params.find((p) => p.key === key)
    if (!spec) {
      problems.push(`range for unknown parameter "${key}"`)
      continue
    }
    const range: [number, number] = [Math.max(lo, spec.min), Math.min(hi, spec.max)]
    if (range[0] > range[1]) problems.push(`range for ${key} lies outside ${spec.min}–${spec.max}`)
    else inside[key] = range
  }
  return { ranges: inside, problems }
}

type SeededEntry = Omit<DemoEntry, 'status'> & { status: DemoEntry['status'] | DemoActivityEntry['status'] }

/** Creates the entry with revision 1 unless it exists; the new entry, or null. */
async function seedEntry(context: AppContext, transaction: Transaction, familyId: string, demo: SeededEntry, report: SeedReport): Promise<Entry | null> {
  const { Entry, EntryRevision, Material, User } = context.db.models
  if (await Entry.findOne({ where: { familyId, name: demo.name }, transaction })) return null
  const skip = (reason: string): null => {
    report.skipped.push({ familyId, name: demo.name, reason })
    return null
  }
  const owner = await User.findOne({ where: { email: demo.owner }, transaction })
  if (!owner) return skip(`owner ${demo.owner} missing`)
  const { ranges, problems } = rangesInsideFamily(familyId, demo.ranges)
  if (problems.length) return skip(problems.join('; '))

  const materials = (await Material.findAll({ transaction })).map((m) => ({ id: m.id, name: m.name, modulus: m.modulus, strainLimit: m.strainLimit, poissonRatio: m.poissonRatio }))
  let evaluation
  try {
    evaluation = evaluate(familyId, demo.defaultParams, { ranges, materials })
  } catch (err) {
    return skip((err as Error).message)
  }
  const entry = await Entry.create({
    familyId, name: demo.name, summary: demo.summary, tags: demo.tags, status: demo.status,
    defaultParams: evaluation.params, ranges, materials: demo.materials, notes: demo.notes,
    ownerId: owner.id, currentRevisionId: null,
  }, { transaction })
  const revision = await EntryRevision.create({
    entryId: entry.id, number: 1, params: evaluation.params, ranges, method: evaluation.method,
    curve: evaluation.curve, metrics: evaluation.metrics, warnings: evaluation.warnings, createdById: owner.id,
  }, { transaction })
  // the entry was created a moment ago; pointing it at its first revision is part of creating it
  await entry.update({ currentRevisionId: revision.id }, { transaction, silent: true })
  report.entriesCreated++
  return entry
}

export interface SeedOptions {
  /** The family ids registered in the catalog (tests pass fewer to mimic families landing later). */
  registeredFamilies?: readonly string[]
  /**
   * Also seed the demo's activity (demo-activity.ts: a proposal in review, test reports, a
   * retired entry, e-mails, saved configurations). The server does on a first start
   * (FLEXSHELF_DEMO_ACTIVITY); tests that count queues and outboxes start without it.
   */
  activity?: boolean
}

/** The advisory lock two instances seeding one PostgreSQL database at the same moment take turns on. */
const SEED_LOCK_KEY = 0x466c7364 // "Flsd"

/** The built-in materials (catalog reference data with their sources, not demo data): in every mode. */
async function seedMaterialsIn(context: AppContext, transaction: Transaction): Promise<number> {
  let created = 0
  for (const m of builtinMaterials) {
    const [, isNew] = await context.db.models.Material.findOrCreate({
      where: { id: m.id },
      defaults: { id: m.id, name: m.name, process: m.process, modulus: m.modulus, poissonRatio: m.poissonRatio, poissonRatioSource: m.poissonRatioSource, strainLimit: m.strainLimit, density: m.density, notes: '', source: m.source },
      transaction,
    })
    if (isNew) created++
  }
  return created
}

export function seedBuiltinMaterials(context: AppContext): Promise<number> {
  return context.db.write((transaction) => seedMaterialsIn(context, transaction))
}

/**
 * Seeds once however many instances start together: on PostgreSQL the whole seed holds an
 * advisory lock, so a second instance waits, then finds every record present and adds none.
 */
export async function seedDemoData(context: AppContext, options: SeedOptions = {}): Promise<SeedReport> {
  const { sequelize } = context.db
  if (sequelize.getDialect() === 'postgres') return withAdvisoryLock(sequelize, SEED_LOCK_KEY, () => seedUnlocked(context, options))
  return seedUnlocked(context, options)
}

async function seedUnlocked(context: AppContext, options: SeedOptions): Promise<SeedReport> {
  const registered = options.registeredFamilies ?? families.map((f) => f.id)
  const { User } = context.db.models
  const report: SeedReport = { usersCreated: 0, materialsCreated: 0, entriesCreated: 0, activityCreated: 0, skipped: [], familiesPending: [] }

  // hash outside the write transaction: bcrypt is slow on purpose, writers should not wait
  const existing = new Set((await User.findAll({ attributes: ['email'] })).map((u) => u.email))
  const missing = DEMO_USERS.filter((u) => !existing.has(u.email))
  const hashes = new Map<string, string>()
  for (const demo of missing) hashes.set(demo.email, await hashPassword(context, DEMO_PASSWORD))

  await context.db.write(async (transaction) => {
    for (const demo of missing) {
      const [, created] = await User.findOrCreate({
        where: { email: demo.email },
        defaults: { email: demo.email, displayName: demo.displayName, role: demo.role, passwordHash: hashes.get(demo.email)! },
        transaction,
      })
      if (created) report.usersCreated++
    }
    report.materialsCreated += await seedMaterialsIn(context, transaction)
    for (const [familyId, entries] of Object.entries(DEMO_SHELF)) {
      if (!registered.includes(familyId) || !families.some((f) => f.id === familyId)) {
        report.familiesPending.push(familyId)
        continue
      }
      for (const demo of entries) await seedEntry(context, transaction, familyId, demo, report)
    }
  })
  if (options.activity) await seedActivity(context, registered, report)
  return report
}

const hoursBefore = (now: Date, hours: number) => new Date(now.getTime() - hours * 3600_000)

/**
 * The demo's activity (demo-activity.ts), each record only when it is missing: entries and
 * configurations by name, reports by their fixed file key, e-mails by subject. The report
 * files are written first, outside the write transaction (it may run more than once), under
 * fixed keys with the same bytes every time, so two instances writing them at once agree.
 */
async function seedActivity(context: AppContext, registered: readonly string[], report: SeedReport): Promise<void> {
  const { Entry, EntryRevision, EntryComment, Material, OutboxMessage, SavedConfiguration, TestReport, User } = context.db.models
  const users = new Map((await User.findAll()).map((u) => [u.email, u]))
  const librarians = (await User.findAll({ where: { role: ['librarian', 'admin'] } })).map((u) => u.email).sort()
  const materials = (await Material.findAll()).map((m) => ({ id: m.id, name: m.name, modulus: m.modulus, strainLimit: m.strainLimit }))
  const store = fileStore(context.config)
  const now = new Date()

  // the curves and their files, from the released entries' current revisions
  const reports: Array<{ demo: DemoReport; entry: Entry; revision: EntryRevision; curve: MeasuredCurve }> = []
  for (const demo of DEMO_REPORTS) {
    const entry = await Entry.findOne({ where: { name: demo.entry, status: 'released' } })
    if (!entry || !registered.includes(entry.familyId) || !entry.currentRevisionId) continue
    if (await TestReport.findOne({ where: { filePath: demo.filePath } })) continue
    const revision = (await EntryRevision.findByPk(entry.currentRevisionId))!
    const curve = syntheticMeasurement(revision.curve, demo.measurement)
    const axes = families.find((f) => f.id === entry.familyId)!.axes
    // a start that stopped between this file and its row left the file behind: write it afresh
    await store.remove(demo.filePath)
    await store.put(demo.filePath, Buffer.from(measurementCsv(curve, { displacement: axes.displacement.unit, force: axes.force.unit })), 'text/csv')
    reports.push({ demo, entry, revision, curve })
  }

  await context.db.write(async (transaction) => {
    const mail = async (to: string[], subject: string, text: string, at: Date) => {
      if (!to.length || (await OutboxMessage.findOne({ where: { subject }, transaction }))) return
      await OutboxMessage.create({ to, subject, text: `${text}

(${DEMO_MARK})`, transport: 'outbox', status: 'sent', error: null, at }, { transaction })
      report.activityCreated++
    }
    for (const demo of DEMO_ACTIVITY_ENTRIES) {
      if (!registered.includes(demo.familyId) || !families.some((f) => f.id === demo.familyId)) continue
      const entry = await seedEntry(context, transaction, demo.familyId, demo, report)
      if (!entry) continue
      report.entriesCreated--
      report.activityCreated++
      const started = hoursBefore(now, 6 * demo.comments.length + 2)
      for (const [i, c] of demo.comments.entries()) {
        const author = users.get(c.author)
        if (!author) continue
        await EntryComment.create({ entryId: entry.id, authorId: author.id, kind: c.kind, text: c.text, createdAt: new Date(started.getTime() + i * 6 * 3600_000) }, { transaction })
        report.activityCreated++
      }
      const owner = users.get(demo.owner)
      if (demo.status === 'in_review' && owner) {
        await mail(librarians, `Flexshelf: entry "${demo.name}" waits for review`, `${owner.displayName} submitted the entry "${demo.name}" for review. It is in the review queue with its computed curve.`, started)
      }
    }
    for (const { demo, entry, revision, curve } of reports) {
      const uploader = users.get(demo.uploader)
      if (!uploader) continue
      const reviewer = demo.reviewer ? users.get(demo.reviewer) ?? null : null
      const { comparison, problem } = compareReport(entry.familyId, { measuredCurve: curve }, revision, materials)
      const uploaded = hoursBefore(now, demo.hoursAgo.uploaded)
      const reviewedAt = demo.hoursAgo.reviewed !== undefined ? hoursBefore(now, demo.hoursAgo.reviewed) : null
      const created = await TestReport.create({
        entryId: entry.id, revisionId: revision.id, uploaderId: uploader.id, reviewerId: reviewer?.id ?? null,
        filePath: demo.filePath, originalName: demo.originalName, photoPath: null,
        printer: demo.printer, material: demo.material, lot: demo.lot, orientation: demo.orientation, testSpeed: demo.testSpeed,
        notes: generatedNote(demo.measurement), reviewNote: demo.reviewNote ?? '', reviewedAt, status: demo.status,
        measuredCurve: curve, comparison: comparison as unknown as Record<string, unknown> | null, comparisonProblem: problem,
        createdAt: uploaded, updatedAt: reviewedAt ?? uploaded,
      }, { transaction, silent: true })
      report.activityCreated++
      await mail(librarians, `Flexshelf: a test report on "${entry.name}" waits for review`, `${uploader.displayName} uploaded test report ${created.id} for "${entry.name}" (entry ${entry.id}, revision ${revision.number}): ${curve.displacement.length} points, printer ${demo.printer}, material ${demo.material}.`, uploaded)
      if (reviewer && reviewedAt) {
        await mail([uploader.email], `Flexshelf: your test report on "${entry.name}" was ${demo.status}`, `Hello ${uploader.displayName},

${reviewer.displayName} ${demo.status} your test report ${created.id} on "${entry.name}".${demo.reviewNote ? `

Note:
${demo.reviewNote}` : ''}`, reviewedAt)
      }
    }
    for (const demo of DEMO_CONFIGURATIONS) {
      const owner = users.get(demo.owner)
      const entry = await Entry.findOne({ where: { name: demo.entry, status: 'released' }, transaction })
      if (!owner || !entry || !registered.includes(entry.familyId)) continue
      if (await SavedConfiguration.findOne({ where: { ownerId: owner.id, name: demo.name }, transaction })) continue
      await SavedConfiguration.create({
        ownerId: owner.id, entryId: entry.id, revisionId: entry.currentRevisionId, name: demo.name, params: demo.params,
        window: demo.window, method: null, tolerance: null, printer: null, shareToken: demo.shared ? newShareToken() : null,
      }, { transaction })
      report.activityCreated++
    }
  })
}
