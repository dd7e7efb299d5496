/**
 * Versioned schema migrations, run with umzug and recorded in the SequelizeMeta table.
 * Add a migration as migrations/NNNN-what.ts and list it below; never edit a released one.
 */
import type { QueryInterface, Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug, type RunnableMigration } from 'umzug'
import * as initial from './migrations/0001-initial'
import * as curation from './migrations/0002-curation'
import * as savedConfigurationSettings from './migrations/0003-saved-configuration-settings'
import * as accounts from './migrations/0004-accounts'
import * as reportComparison from './migrations/0005-report-comparison'
import * as materialPoissonRatio from './migrations/0006-material-poisson-ratio'

const migrations: RunnableMigration<QueryInterface>[] = [
  { name: '0001-initial', up: initial.up, down: initial.down },
  { name: '0002-curation', up: curation.up, down: curation.down },
  { name: '0003-saved-configuration-settings', up: savedConfigurationSettings.up, down: savedConfigurationSettings.down },
  { name: '0004-accounts', up: accounts.up, down: accounts.down },
  { name: '0005-report-comparison', up: reportComparison.up, down: reportComparison.down },
  { name: '0006-material-poisson-ratio', up: materialPoissonRatio.up, down: materialPoissonRatio.down },
]

export function createMigrator(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations,
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  })
}

/** Any fixed number: the advisory lock that instances starting together on one PostgreSQL database take turns on. */
const MIGRATION_LOCK_KEY = 0x466c7873 // "Flxs"

/**
 * Applies every pending migration; returns the names applied. On PostgreSQL a session-level
 * advisory lock, held on one connection for the whole run, makes a second instance starting
 * at the same moment wait and then find nothing left to apply.
 */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  if (sequelize.getDialect() !== 'postgres') return (await createMigrator(sequelize).up()).map((m) => m.name)
  return withAdvisoryLock(sequelize, MIGRATION_LOCK_KEY, async () => (await createMigrator(sequelize).up()).map((m) => m.name))
}

/**
 * Runs `work` while this process holds a PostgreSQL advisory lock (pg_advisory_lock waits
 * for another holder). The lock lives on one pooled connection taken for the whole run;
 * `work` itself uses the pool as usual.
 */
export async function withAdvisoryLock<T>(sequelize: Sequelize, key: number, work: () => Promise<T>): Promise<T> {
  const manager = sequelize.connectionManager as unknown as {
    getConnection(options?: unknown): Promise<{ query(sql: string): Promise<unknown> }>
    releaseConnection(connection: unknown): Promise<void>
  }
  const connection = await manager.getConnection({ type: 'write' })
  try {
    await connection.query(`SELECT pg_advisory_lock(${Number(key)})`)
    try {
      return await work()
    } finally {
      await connection.query(`SELECT pg_advisory_unlock(${Number(key)})`)
    }
  } finally {
    await manager.releaseConnection(connection)
  }
}
