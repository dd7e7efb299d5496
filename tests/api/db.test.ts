import { rmSync } from 'node:fs'
import { join } from 'node:path'
import { QueryTypes, Transaction, type Sequelize } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openDatabase, ImmutableRevisionError, type Database } from '../../api/db'
import { openSequelize } from '../../api/db/connection'
import { migrate } from '../../api/db/migrate'
import { makeTempDir, onPostgres } from './helpers'

let dataDir: string
let db: Database
beforeAll(async () => {
  dataDir = makeTempDir()
  db = await openDatabase(join(dataDir, 'flexshelf.sqlite'))
})
afterAll(async () => {
  await db.close()
  rmSync(dataDir, { recursive: true, force: true })
})

async function pragma(sequelize: Sequelize, name: string, transaction?: Transaction): Promise<unknown> {
  const rows = await sequelize.query<Record<string, unknown>>(`PRAGMA ${name}`, { type: QueryTypes.SELECT, transaction })
  return Object.values(rows[0])[0]
}

const EXPECTED_TABLES: Record<string, string[]> = {
  Users: ['id', 'email', 'passwordHash', 'displayName', 'role', 'tokenVersion', 'passwordMustChange', 'carriedSessionJti', 'oidcIssuer', 'oidcSubject', 'createdAt', 'updatedAt'],
  Materials: ['id', 'name', 'process', 'modulus', 'poissonRatio', 'poissonRatioSource', 'strainLimit', 'density', 'notes', 'source', 'createdAt', 'updatedAt'],
  Entries: ['id', 'familyId', 'name', 'summary', 'tags', 'status', 'defaultParams', 'ranges', 'materials', 'notes', 'ownerId', 'currentRevisionId', 'proposalForId', 'createdAt', 'updatedAt'],
  EntryRevisions: ['id', 'entryId', 'number', 'params', 'ranges', 'method', 'curve', 'metrics', 'warnings', 'createdById', 'createdAt'],
  TestReports: ['id', 'entryId', 'revisionId', 'uploaderId', 'reviewerId', 'filePath', 'originalName', 'photoPath', 'printer', 'material', 'lot', 'orientation', 'testSpeed', 'notes', 'reviewNote', 'reviewedAt', 'status', 'measuredCurve', 'comparison', 'comparisonProblem', 'createdAt', 'updatedAt'],
  SavedConfigurations: ['id', 'ownerId', 'entryId', 'revisionId', 'name', 'params', 'window', 'method', 'tolerance', 'printer', 'shareToken', 'createdAt', 'updatedAt'],
  AuditEvents: ['id', 'actorId', 'action', 'subjectType', 'subjectId', 'details', 'at'],
  RevokedTokens: ['jti', 'expiresAt'],
  EntryComments: ['id', 'entryId', 'authorId', 'kind', 'text', 'createdAt'],
  OutboxMessages: ['id', 'to', 'subject', 'text', 'transport', 'status', 'error', 'at'],
  PasswordResetTokens: ['id', 'userId', 'tokenHash', 'expiresAt', 'usedAt', 'createdAt'],
  SequelizeMeta: ['name'],
}

describe('migrations', () => {
  describe('from an empty database', () => {
    let sequelize: Sequelize
    let applied: string[]
    beforeAll(async () => {
      sequelize = openSequelize(join(dataDir, 'empty.sqlite'))
      applied = await migrate(sequelize)
    })
    afterAll(() => sequelize.close())

    it('applies every migration in order', () => {
      expect(applied).toEqual(['0001-initial', '0002-curation', '0003-saved-configuration-settings', '0004-accounts', '0005-report-comparison', '0006-material-poisson-ratio'])
    })

    it('produces exactly the expected tables and columns', async () => {
      const queryInterface = sequelize.getQueryInterface()
      const tables = (await queryInterface.showAllTables()).map((t) => (typeof t === 'string' ? t : (t as { tableName: string }).tableName))
      expect(tables.sort()).toEqual(Object.keys(EXPECTED_TABLES).sort())
      for (const [table, columns] of Object.entries(EXPECTED_TABLES)) {
        const observed = Object.keys(await queryInterface.describeTable(table))
        expect(observed.sort(), table).toEqual([...columns].sort())
      }
    })

    it('makes e-mails unique and points entries at their owners', async () => {
      const queryInterface = sequelize.getQueryInterface()
      const indexes = await queryInterface.showIndex('Users') as Array<{ unique: boolean | number; fields: Array<{ attribute: string }> }>
      const uniqueColumns = indexes.filter((i) => i.unique).flatMap((i) => i.fields.map((f) => f.attribute))
      expect(uniqueColumns).toContain('email')
      const keys = await queryInterface.getForeignKeyReferencesForTable('Entries') as Array<{ columnName: string; referencedTableName: string }>
      expect(keys.map((k) => `${k.columnName}->${k.referencedTableName}`).sort()).toEqual(['currentRevisionId->EntryRevisions', 'ownerId->Users', 'proposalForId->Entries'])
    })

    it('applies nothing the second time', async () => {
      expect(await migrate(sequelize)).toEqual([])
    })
  })
})

describe('every SQLite connection', () => {
  describe.skipIf(onPostgres)('outside a transaction', () => {
    it('runs in WAL mode with foreign keys on, a busy timeout and full sync', async () => {
      expect(await pragma(db.sequelize, 'journal_mode')).toBe('wal')
      expect(await pragma(db.sequelize, 'foreign_keys')).toBe(1)
      expect(await pragma(db.sequelize, 'busy_timeout')).toBe(5000)
      // synchronous: 2 = FULL
      expect(await pragma(db.sequelize, 'synchronous')).toBe(2)
    })
  })

  describe('inside a transaction (its own connection)', () => {
    it.skipIf(onPostgres)('has the same settings', async () => {
      const observed = await db.write(async (transaction) => ({
        foreignKeys: await pragma(db.sequelize, 'foreign_keys', transaction),
        journalMode: await pragma(db.sequelize, 'journal_mode', transaction),
        busyTimeout: await pragma(db.sequelize, 'busy_timeout', transaction),
        synchronous: await pragma(db.sequelize, 'synchronous', transaction),
      }))
      expect(observed).toEqual({ foreignKeys: 1, journalMode: 'wal', busyTimeout: 5000, synchronous: 2 })
    })

    it('refuses a row that points at a missing user, and keeps nothing of the transaction', async () => {
      const { Entry, Material } = db.models
      const write = db.write(async (transaction) => {
        await Material.create({ id: 'half-written', name: 'x', process: 'FDM', modulus: 1, poissonRatio: 0.35, poissonRatioSource: 'test', strainLimit: 0.01, density: 1, source: 'test' }, { transaction })
        await Entry.create({ familyId: 'bistable-beam', name: 'orphan', summary: '', tags: [], status: 'draft', defaultParams: {}, ranges: {}, materials: [], ownerId: 424242, currentRevisionId: null }, { transaction })
      })
      await expect(write).rejects.toThrow(onPostgres ? /violates foreign key constraint/ : /FOREIGN KEY constraint failed/)
      expect(await Material.findByPk('half-written')).toBeNull()
      expect(await Entry.count({ where: { name: 'orphan' } })).toBe(0)
    })
  })
})

describe('the write queue', () => {
  describe('with many concurrent writers', () => {
    it(`runs them one at a time as ${onPostgres ? 'SERIALIZABLE' : 'IMMEDIATE'} transactions, all committed`, async () => {
      const { Material } = db.models
      let running = 0
      let most = 0
      await Promise.all(Array.from({ length: 12 }, (_, i) => db.write(async (transaction) => {
        running++
        most = Math.max(most, running)
        const options = (transaction as unknown as { options: { type: string; isolationLevel: string } }).options
        if (onPostgres) expect(options.isolationLevel).toBe(Transaction.ISOLATION_LEVELS.SERIALIZABLE)
        else expect(options.type).toBe(Transaction.TYPES.IMMEDIATE)
        const count = await Material.count({ transaction })
        await Material.create({ id: `queued-${i}`, name: `queued ${count}`, process: 'FDM', modulus: 1, poissonRatio: 0.35, poissonRatioSource: 'test', strainLimit: 0.01, density: 1, source: 'test' }, { transaction })
        running--
      })))
      expect(most).toBe(1)
      expect(await Material.count({ where: { process: 'FDM', source: 'test' } })).toBe(12)
    })
  })

  describe('after a failed write', () => {
    it('still runs the next one', async () => {
      await expect(db.write(async () => { throw new Error('deliberate') })).rejects.toThrow('deliberate')
      expect(await db.write(async () => 'next')).toBe('next')
    })
  })
})

describe('EntryRevision', () => {
  describe('once written', () => {
    it('refuses updates, one by one or in bulk', async () => {
      const { User, Entry, EntryRevision } = db.models
      const revision = await db.write(async (transaction) => {
        const owner = await User.create({ email: 'rev@example.test', displayName: 'Rev Owner', role: 'librarian', passwordHash: 'x' }, { transaction })
        const entry = await Entry.create({ familyId: 'bistable-beam', name: 'frozen', summary: '', tags: [], status: 'released', defaultParams: {}, ranges: {}, materials: [], ownerId: owner.id, currentRevisionId: null }, { transaction })
        return EntryRevision.create({ entryId: entry.id, number: 1, params: { span: 40 }, ranges: {}, method: 'closed-form', curve: { displacement: [0], force: [0], axes: { displacement: { label: 'd', unit: 'mm' }, force: { label: 'F', unit: 'N' } } }, metrics: {}, warnings: [], createdById: owner.id }, { transaction })
      })
      await expect(revision.update({ method: 'changed' })).rejects.toThrow(ImmutableRevisionError)
      await expect(EntryRevision.update({ method: 'changed' }, { where: { id: revision.id } })).rejects.toThrow(ImmutableRevisionError)
      expect((await EntryRevision.findByPk(revision.id))!.method).toBe('closed-form')
    })
  })
})
