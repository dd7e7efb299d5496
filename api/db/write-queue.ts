/**
 * One way to run a write transaction, whichever database holds the data.
 *
 * SQLite has one writer at a time. Running every write transaction through one queue
 * keeps writers from waiting on each other's locks (and from SQLITE_BUSY when a
 * deferred transaction tries to upgrade its read lock); each runs as BEGIN IMMEDIATE.
 *
 * PostgreSQL is shared by several instances, so an in-process queue cannot order their
 * writes. Each write runs SERIALIZABLE instead: PostgreSQL then guarantees the outcome of
 * some one-at-a-time order (the read-check-write steps of the services, such as the next
 * revision number, stay correct across instances), and a transaction that would break that
 * is rolled back with SQLSTATE 40001 and simply run again. The queue is kept within one
 * process so its own writers do not conflict with each other.
 */
import { Transaction, type Sequelize } from 'sequelize'

export type WriteFn = <T>(work: (transaction: Transaction) => Promise<T>) => Promise<T>

/** Tries of one write before the conflict is reported (each conflict means another instance committed). */
const SERIALIZATION_TRIES = 8

function isSerializationFailure(err: unknown): boolean {
  const code = (err as { parent?: { code?: string }; original?: { code?: string } })?.parent?.code
    ?? (err as { original?: { code?: string } })?.original?.code
  // 40001 serialization_failure, 40P01 deadlock_detected: both are safe to run again
  return code === '40001' || code === '40P01'
}

export function createWriteQueue(sequelize: Sequelize): WriteFn {
  const postgres = sequelize.getDialect() === 'postgres'
  const once = <T>(work: (transaction: Transaction) => Promise<T>): Promise<T> => postgres
    ? sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.SERIALIZABLE }, work)
    : sequelize.transaction({ type: Transaction.TYPES.IMMEDIATE }, work)
  const withRetries = async <T>(work: (transaction: Transaction) => Promise<T>): Promise<T> => {
    for (let attempt = 1; ; attempt++) {
      try {
        return await once(work)
      } catch (err) {
        if (!postgres || !isSerializationFailure(err) || attempt >= SERIALIZATION_TRIES) throw err
        // a short random pause so two instances that collided do not collide again
        await new Promise((resolve) => setTimeout(resolve, Math.random() * 20 * attempt))
      }
    }
  }
  let tail: Promise<unknown> = Promise.resolve()
  return function write<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
    const run = tail.then(() => withRetries(work))
    // the next write starts after this one settles, whether it committed or rolled back
    tail = run.catch(() => undefined)
    return run
  }
}
