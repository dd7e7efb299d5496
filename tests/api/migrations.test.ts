/**
 * Migrations are forward-only and keep data: from every earlier schema (after 0001 only, the
 * first release's, and after each later one) with rows in it, migrating to the latest keeps
 * every row and value, gives the new columns their defaults, and the models read the rows.
 * The list in migrate.ts is every file of migrations/, numbered in order, never reordered.
 */
import { readdirSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { QueryTypes, type Sequelize } from 'sequelize'
import { afterEach, describe, expect, it } from 'vitest'
import { openSequelize } from '../../api/db/connection'
import { createMigrator, migrate } from '../../api/db/migrate'
import { defineModels } from '../../api/db/models'
import { makeTempDir } from './helpers'

const MIGRATIONS_DIR = fileURLToPath(new URL('../../api/db/migrations', import.meta.url))

const opened: Array<{ sequelize: Sequelize; dir: string }> = []
afterEach(async () => {
  for (const { sequelize, dir } of opened.splice(0)) {
    await sequelize.close()
    rmSync(dir, { recursive: true, force: true })
  }
})

function freshDatabase(): Sequelize {
  const dir = makeTempDir('flexshelf-migrations-')
  const sequelize = openSequelize(join(dir, 'flexshelf.sqlite'))
  opened.push({ sequelize, dir })
  return sequelize
}

const NOW = '2026-03-02 09:15:00.000 +00:00'

/** Rows in every table of the first release's schema (0001), written as that release would. */
async function writeFirstReleaseRows(sequelize: Sequelize): Promise<void> {
  // quoted names: PostgreSQL folds unquoted ones to lower case (SQLite takes either)
  const insert = (table: string, row: Record<string, unknown>) => sequelize.query(
    `INSERT INTO "${table}" (${Object.keys(row).map((c) => `"${c}"`).join(', ')}) VALUES (${Object.keys(row).map(() => '?').join(', ')})`,
    { replacements: Object.values(row) },
  )
  await insert('Users', { id: 7, email: 'old.release@example.test', passwordHash: '$2b$10$abcdefghijklmnopqrstuuO1Z0Jb2c4b6mQ8p5s7r9t1v3x5z7B9C', displayName: 'Orla Release', role: 'librarian', tokenVersion: 2, createdAt: NOW, updatedAt: NOW })
  await insert('Materials', { id: 'petg-lot-3', name: 'PETG lot 3', process: 'FDM', modulus: 1870, strainLimit: 0.019, density: 1.27, notes: 'bench-calibrated', source: 'test stand, lot 3', createdAt: NOW, updatedAt: NOW })
  await insert('Entries', { id: 11, familyId: 'snap-hook', name: 'Lid latch, first release', summary: 'kept across migrations', tags: '["lid","latch"]', status: 'released', defaultParams: '{"length":15}', ranges: '{"length":[10,20]}', materials: '["petg-lot-3"]', notes: 'note', ownerId: 7, currentRevisionId: null, createdAt: NOW, updatedAt: NOW })
  await insert('EntryRevisions', { id: 21, entryId: 11, number: 1, params: '{"length":15}', ranges: '{"length":[10,20]}', method: 'snap-fit-equations', curve: '{"displacement":[0,1],"force":[0,2]}', metrics: '{"matingForce":2}', warnings: '[]', createdById: 7, createdAt: NOW })
  await sequelize.query('UPDATE "Entries" SET "currentRevisionId" = 21 WHERE "id" = 11')
  await insert('TestReports', { id: 31, entryId: 11, revisionId: 21, uploaderId: 7, reviewerId: null, filePath: 'reports/abc.csv', originalName: 'run 1.csv', photoPath: null, printer: 'Bench printer 1', material: 'PETG', lot: 'L-3', orientation: 'flat', testSpeed: 10, notes: '', status: 'submitted', measuredCurve: '{"displacement":[0,1],"force":[0,1.8]}', createdAt: NOW, updatedAt: NOW })
  await insert('SavedConfigurations', { id: 41, ownerId: 7, entryId: 11, revisionId: 21, name: 'Kept configuration', params: '{"length":14}', window: null, shareToken: 'tok-first-release', createdAt: NOW, updatedAt: NOW })
  await insert('AuditEvents', { id: 51, actorId: 7, action: 'user.signup', subjectType: 'user', subjectId: '7', details: '{"email":"old.release@example.test"}', at: NOW })
  await insert('RevokedTokens', { jti: 'jti-first-release', expiresAt: NOW })
}

const FIRST_RELEASE_TABLES = ['Users', 'Materials', 'Entries', 'EntryRevisions', 'TestReports', 'SavedConfigurations', 'AuditEvents', 'RevokedTokens']

/** Every column the first release wrote, row by row, so a migration that rewrites a table must carry them all. */
async function snapshot(sequelize: Sequelize, columns: Record<string, string[]>): Promise<Record<string, unknown[]>> {
  const out: Record<string, unknown[]> = {}
  for (const table of FIRST_RELEASE_TABLES) {
    out[table] = await sequelize.query(`SELECT ${columns[table].map((c) => `"${c}"`).join(', ')} FROM "${table}" ORDER BY 1`, { type: QueryTypes.SELECT })
  }
  return out
}

async function columnsOf(sequelize: Sequelize): Promise<Record<string, string[]>> {
  const out: Record<string, string[]> = {}
  for (const table of FIRST_RELEASE_TABLES) {
    out[table] = Object.keys(await sequelize.getQueryInterface().describeTable(table))
  }
  return out
}

/** Every migration's name, in order (all of them are pending on a fresh database). */
const names = async (sequelize: Sequelize) => (await createMigrator(sequelize).pending()).map((m) => m.name)

describe('the migration list', () => {
  it('names every file in migrations/, numbered 0001, 0002, … in order', async () => {
    const files = readdirSync(MIGRATIONS_DIR).filter((f) => /\.ts$/.test(f)).map((f) => f.replace(/\.ts$/, '')).sort()
    const listed = await names(freshDatabase())
    expect(listed).toEqual(files)
    listed.forEach((name, i) => expect(name.slice(0, 4)).toBe(String(i + 1).padStart(4, '0')))
  })
})

describe('migrating to the latest schema', () => {
  it('from empty applies every migration, then nothing the second time', async () => {
    const sequelize = freshDatabase()
    const expected = await names(sequelize)
    expect(expected.length).toBeGreaterThanOrEqual(3)
    expect(await migrate(sequelize)).toEqual(expected)
    expect(await migrate(sequelize)).toEqual([])
  })

  describe('from each earlier schema with data in it', async () => {
    const all = await names(freshDatabase())
    for (const last of all.slice(0, -1)) {
      it(`after ${last}: keeps every row and value, and the models read them`, async () => {
        const sequelize = freshDatabase()
        await createMigrator(sequelize).up({ to: last })
        await writeFirstReleaseRows(sequelize)
        const firstColumns = await columnsOf(sequelize)
        const before = await snapshot(sequelize, firstColumns)

        const applied = await migrate(sequelize)
        expect(applied).toEqual(all.slice(all.indexOf(last) + 1))
        const observed = await snapshot(sequelize, firstColumns)
        expect(observed).toEqual(before)
        // SQLite checks its file and the references on request; PostgreSQL enforces references on every write
        if (sequelize.getDialect() === 'sqlite') {
          const [{ integrity_check }] = await sequelize.query<{ integrity_check: string }>('PRAGMA integrity_check', { type: QueryTypes.SELECT })
          expect(integrity_check).toBe('ok')
          const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*) AS n FROM pragma_foreign_key_check', { type: QueryTypes.SELECT })
          expect(n).toBe(0)
        }

        // the current models read the old rows (new columns have their defaults)
        const models = defineModels(sequelize)
        const user = await models.User.findByPk(7)
        expect(user?.email).toBe('old.release@example.test')
        const entry = await models.Entry.findByPk(11)
        expect(entry?.tags).toEqual(['lid', 'latch'])
        expect(entry?.currentRevisionId).toBe(21)
        const saved = await models.SavedConfiguration.findByPk(41)
        expect(saved?.params).toEqual({ length: 14 })
        const report = await models.TestReport.findByPk(31)
        expect(report?.measuredCurve).toEqual({ displacement: [0, 1], force: [0, 1.8] })
        // 0006: a material that is neither built in nor calibrated from one gets 0.35, named as common practice
        const material = await models.Material.findByPk('petg-lot-3')
        expect(material?.poissonRatio).toBe(0.35)
        expect(material?.poissonRatioSource).toMatch(/common practice/)
      })
    }
  })
})
