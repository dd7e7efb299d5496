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

export interface SeedReport {
  usersCreated: number
  materialsCreated: number
  entriesCreated: number
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

async function seedEntry(context: AppContext, transaction: Transaction, familyId: string, demo: DemoEntry, report: SeedReport): Promise<void> {
  const { Entry, EntryRevision, Material, User } = context.db.models
  if (await Entry.findOne({ where: { familyId, name: demo.name }, transaction })) return
  const skip = (reason: string): void => {
    report.skipped.push({ familyId, name: demo.name, reason })
  }
  const owner = await User.findOne({ where: { email: demo.owner }, transaction })
  if (!owner) return skip(`owner ${demo.owner} missing`)
  const { ranges, problems } = rangesInsideFamily(familyId, demo.ranges)
  if (problems.length) return skip(problems.join('; '))

  const materials = (await Material.findAll({ transaction })).map((m) => ({ id: m.id, name: m.name, modulus: m.modulus, strainLimit: m.strainLimit }))
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
}

export interface SeedOptions {
  /** The family ids registered in the catalog (tests pass fewer to mimic families landing later). */
  registeredFamilies?: readonly string[]
}

/** The advisory lock two instances seeding one PostgreSQL database at the same moment take turns on. */
const SEED_LOCK_KEY = 0x466c7364 // "Flsd"

/** The built-in materials (catalog reference data with their sources, not demo data): in every mode. */
async function seedMaterialsIn(context: AppContext, transaction: Transaction): Promise<number> {
  let created = 0
  for (const m of builtinMaterials) {
    const [, isNew] = await context.db.models.Material.findOrCreate({
      where: { id: m.id },
      defaults: { id: m.id, name: m.name, process: m.process, modulus: m.modulus, strainLimit: m.strainLimit, density: m.density, notes: '', source: m.source },
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
  const report: SeedReport = { usersCreated: 0, materialsCreated: 0, entriesCreated: 0, skipped: [], familiesPending: [] }

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
  return report
}
