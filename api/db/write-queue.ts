/**
 * SQLite has one writer at a time. Running every write transaction through one queue
 * keeps writers from waiting on each other's locks (and from SQLITE_BUSY when a
 * deferred transaction tries to upgrade its read lock); each runs as BEGIN IMMEDIATE.
 */
import { Transaction, type Sequelize } from 'sequelize'

export type WriteFn = <T>(work: (transaction: Transaction) => Promise<T>) => Promise<T>

export function createWriteQueue(sequelize: Sequelize): WriteFn {
  let tail: Promise<unknown> = Promise.resolve()
  return function write<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
    const run = tail.then(() => sequelize.transaction({ type: Transaction.TYPES.IMMEDIATE }, work))
    // the next write starts after this one settles, whether it committed or rolled back
    tail = run.catch(() => undefined)
    return run
  }
}
