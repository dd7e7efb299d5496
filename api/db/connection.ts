/**
 * The SQLite connection through Sequelize.
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
export const CONNECTION_PRAGMAS = [
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

export function openSequelize(databaseFile: string): Sequelize {
  mkdirSync(dirname(databaseFile), { recursive: true })
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    storage: databaseFile,
    logging: false,
    define: { freezeTableName: false },
  })
  prepareEveryConnection(sequelize)
  return sequelize
}
