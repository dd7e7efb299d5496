/**
 * The database connection through Sequelize: the embedded SQLite file by default, or
 * PostgreSQL when FLEXSHELF_DATABASE_URL is a postgres:// URL (several instances share it).
 *
 * Sequelize's SQLite dialect opens a separate sqlite3 connection for every transaction
 * and never runs the afterConnect hook, so a PRAGMA sent with sequelize.query reaches
 * only one connection. We wrap the connection manager so that each raw connection runs
 * the PRAGMAs once, before its first statement.
 */
import { mkdirSync } from 'node:fs'
import { dirname } from 'node:path'
import { Sequelize } from 'sequelize'

// busy_timeout first, so the others wait for a lock rather than fail; WAL lets readers
// run beside the one writer; synchronous=FULL because a committed change must survive
// a power cut (the data folder is the only copy).
const CONNECTION_PRAGMAS = [
  'PRAGMA busy_timeout = 5000',
  'PRAGMA foreign_keys = ON',
  'PRAGMA journal_mode = WAL',
  'PRAGMA synchronous = FULL',
]

interface RawConnection {
  exec(sql: string, callback: (err: Error | null) => void): void
}

interface ConnectionManagerInternals {
  getConnection(options?: unknown): Promise<RawConnection>
}

function execute(connection: RawConnection, sql: string): Promise<void> {
  return new Promise((resolve, reject) => connection.exec(sql, (err) => (err ? reject(err) : resolve())))
}

function prepareEveryConnection(sequelize: Sequelize): void {
  const manager = sequelize.connectionManager as unknown as ConnectionManagerInternals
  const original = manager.getConnection.bind(manager)
  // the same raw connection is handed out to concurrent callers; all of them wait for
  // the one preparation
  const prepared = new WeakMap<RawConnection, Promise<void>>()
  manager.getConnection = async (options?: unknown) => {
    const connection = await original(options)
    let ready = prepared.get(connection)
    if (!ready) {
      ready = execute(connection, CONNECTION_PRAGMAS.join('; ') + ';')
      prepared.set(connection, ready)
    }
    await ready
    return connection
  }
}

/**
 * True for a postgres:// (or postgresql://) URL; anything else names an SQLite file.
 * @public tests/api/setup-database.ts calls it through the mocked module's original.
 */
export function isPostgresUrl(target: string): boolean {
  return /^postgres(ql)?:\/\//i.test(target)
}

export interface PostgresOptions {
  /** Connections per process (each API instance and each worker holds its own pool). */
  poolMax?: number
  /** Runs before every new connection (test:pg creates the throwaway database here). */
  beforeConnect?: () => Promise<void>
}

function openPostgres(url: string, options: PostgresOptions): Sequelize {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    define: { freezeTableName: false },
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000, acquire: 30_000 },
    // timestamps are stored with their zone; the server answers in UTC like the SQLite build
    timezone: '+00:00',
  })
  if (options.beforeConnect) sequelize.addHook('beforeConnect', options.beforeConnect)
  return sequelize
}

/** Opens a database: an SQLite file path, or a postgres:// URL. */
export function openSequelize(target: string, options: PostgresOptions = {}): Sequelize {
  if (isPostgresUrl(target)) return openPostgres(target, options)
  const databaseFile = target
  mkdirSync(dirname(databaseFile), { recursive: true, mode: 0o700 })
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    storage: databaseFile,
    logging: false,
    define: { freezeTableName: false },
  })
  prepareEveryConnection(sequelize)
  return sequelize
}
