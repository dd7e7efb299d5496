/**
 * Answers of the busiest reads (the shelf list, an entry page, who a bearer token belongs
 * to), kept until a table they were read from changes. Sequelize model hooks count every
 * write to a table (instance and bulk, create, update, destroy); a cached answer remembers
 * the counts it was read at and is used only while they are unchanged. A write inside a
 * transaction counts at once and again after the commit, so an answer read in between
 * (from before the commit) is not kept either.
 *
 * With the embedded SQLite file one server process owns the database, so every write passes
 * through these hooks; raw SQL writes would not, and the API has none on these tables. With
 * several instances on one PostgreSQL database, each announces its committed writes over Redis
 * (shared-state.ts) and counts the others' as they arrive, so a retire on one instance is off
 * the other's shelf list within the message's trip (milliseconds).
 */
import { LRUCache } from 'lru-cache'
import type { Model, ModelStatic, Transaction } from 'sequelize'
import type { Database } from '../db'

export type TableName = 'Entry' | 'EntryRevision' | 'User' | 'RevokedToken' | 'TestReport' | 'EntryComment' | 'Material'

const TABLES: readonly TableName[] = ['Entry', 'EntryRevision', 'User', 'RevokedToken', 'TestReport', 'EntryComment', 'Material']

const WRITE_HOOKS = ['afterCreate', 'afterUpdate', 'afterDestroy', 'afterSave', 'afterUpsert', 'afterRestore', 'afterBulkCreate', 'afterBulkUpdate', 'afterBulkDestroy'] as const

/** Entries per cache before the least recently used are dropped (a cached token per signed-in session). */
const MAX_ENTRIES = 5000

interface Cached<T> {
  stamp: string
  value: T
}

export class ReadCache {
  private readonly writes = new Map<TableName, number>()
  private readonly stores = new Map<string, LRUCache<string, Cached<unknown>>>()

  constructor(db: Database) {
    const models = db.models as unknown as Record<TableName, ModelStatic<Model> | undefined>
    for (const table of TABLES) {
      const model = models[table]
      if (!model) continue
      const counted = (_a: unknown, b?: unknown) => {
        this.count(table)
        // bulk hooks get the options first, instance hooks second
        const options = ((b ?? _a) ?? {}) as { transaction?: Transaction | null }
        if (options.transaction) {
          options.transaction.afterCommit(() => {
            this.count(table)
            this.announce?.(table)
          })
        } else {
          this.announce?.(table)
        }
      }
      for (const hook of WRITE_HOOKS) model.addHook(hook as never, `read-cache-${hook}`, counted as never)
    }
  }

  /** Tells the other instances of a committed write (shared-state.ts, Redis pub/sub); unset with one instance. */
  private announce: ((table: TableName) => void) | null = null

  /** Several instances on one database: every committed write here is announced through `announce`. */
  announceWritesTo(announce: ((table: TableName) => void) | null): void {
    this.announce = announce
  }

  /** Another instance committed a write to `table`: answers read from it before are no longer used. */
  writtenElsewhere(table: TableName): void {
    if (TABLES.includes(table)) this.count(table)
  }

  private count(table: TableName): void {
    this.writes.set(table, (this.writes.get(table) ?? 0) + 1)
  }

  private stampOf(tables: readonly TableName[]): string {
    return tables.map((t) => this.writes.get(t) ?? 0).join('.')
  }

  /** The cached answer for `key` if none of `tables` changed since it was read; otherwise reads it. */
  async read<T>(store: string, key: string, tables: readonly TableName[], load: () => Promise<T>): Promise<T> {
    let entries = this.stores.get(store)
    if (!entries) this.stores.set(store, (entries = new LRUCache({ max: MAX_ENTRIES })))
    const hit = entries.get(key)
    if (hit && hit.stamp === this.stampOf(tables)) return hit.value as T
    // the stamp before reading: a write during the read leaves this answer already stale
    const stamp = this.stampOf(tables)
    const value = await load()
    entries.set(key, { stamp, value })
    return value
  }
}

const caches = new WeakMap<Database, ReadCache>()

export function readCache(db: Database): ReadCache {
  let cache = caches.get(db)
  if (!cache) caches.set(db, (cache = new ReadCache(db)))
  return cache
}
