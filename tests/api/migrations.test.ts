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
  const q = (sql: string, replacements: unknown[]) => sequelize.query(sql, { replacements })
  await q('INSERT INTO Users (id, email, passwordHash, displayName, role, tokenVersion, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?)',
    [7, 'old.release@example.test', '$2b$10$abcdefghijklmnopqrstuuO1Z0Jb2c4b6mQ8p5s7r9t1v3x5z7B9C', 'Orla Release', 'librarian', 2, NOW, NOW])
  await q('INSERT INTO Materials (id, name, process, modulus, strainLimit, density, notes, source, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    ['petg-lot-3', 'PETG lot 3', 'FDM', 1870, 0.019, 1.27, 'bench-calibrated', 'test stand, lot 3', NOW, NOW])
  await q('INSERT INTO Entries (id, familyId, name, summary, tags, status, defaultParams, ranges, materials, notes, ownerId, currentRevisionId, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, NULL, ?, ?)',
    [11, 'snap-hook', 'Lid latch, first release', 'kept across migrations', '["lid","latch"]', 'released', '{"length":15}', '{"length":[10,20]}', '["petg-lot-3"]', 'note', 7, NOW, NOW])
  await q('INSERT INTO EntryRevisions (id, entryId, number, params, ranges, method, curve, metrics, warnings, createdById, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    [21, 11, 1, '{"length":15}', '{"length":[10,20]}', 'snap-fit-equations', '{"displacement":[0,1],"force":[0,2]}', '{"matingForce":2}', '[]', 7, NOW])
  await q('UPDATE Entries SET currentRevisionId = 21 WHERE id = 11', [])
  await q('INSERT INTO TestReports (id, entryId, revisionId, uploaderId, reviewerId, filePath, originalName, photoPath, printer, material, lot, orientation, testSpeed, notes, status, measuredCurve, createdAt, updatedAt) VALUES (?, ?, ?, ?, NULL, ?, ?, NULL, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    [31, 11, 21, 7, 'reports/abc.csv', 'run 1.csv', 'Bench printer 1', 'PETG', 'L-3', 'flat', 10, '', 'submitted', '{"displacement":[0,1],"force":[0,1.8]}', NOW, NOW])
  await q('INSERT INTO SavedConfigurations (id, ownerId, entryId, revisionId, name, params, window, shareToken, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, ?, NULL, ?, ?, ?)',
    [41, 7, 11, 21, 'Kept configuration', '{"length":14}', 'tok-first-release', NOW, NOW])
  await q('INSERT INTO AuditEvents (id, actorId, action, subjectType, subjectId, details, at) VALUES (?, ?, ?, ?, ?, ?, ?)',
    [51, 7, 'user.signup', 'user', '7', '{"email":"old.release@example.test"}', NOW])
  await q('INSERT INTO RevokedTokens (jti, expiresAt) VALUES (?, ?)', ['jti-first-release', NOW])
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
    const rows = await sequelize.query<{ name: string }>(`PRAGMA table_info("${table}")`, { type: QueryTypes.SELECT })
    out[table] = rows.map((r) => r.name)
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
        const [{ integrity_check }] = await sequelize.query<{ integrity_check: string }>('PRAGMA integrity_check', { type: QueryTypes.SELECT })
        expect(integrity_check).toBe('ok')
        const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*) AS n FROM pragma_foreign_key_check', { type: QueryTypes.SELECT })
        expect(n).toBe(0)

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
      })
    }
  })
})
