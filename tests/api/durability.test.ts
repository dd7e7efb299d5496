/**
 * Durability of the real server process (issue 8): concurrent writes never fail with
 * "database is locked"; a SIGKILL in the middle of them (no shutdown, no flush) loses no
 * acknowledged write and leaves a database whose PRAGMA integrity_check is "ok"; the server
 * restarts on the same data folder and keeps writing. synchronous = FULL is what makes an
 * acknowledged commit survive (api/db/connection.ts).
 */
import { rmSync } from 'node:fs'
import { join } from 'node:path'
import sqlite3 from 'sqlite3'
import { afterAll, describe, expect, it } from 'vitest'
import { startServer, type RunningServer } from '../e2e/support/server'
import { apiSignIn } from '../e2e/support/views'

// bcrypt at the lowest cost the server accepts, so sign-ups are quick enough to run many;
// every sign-up here comes from one loopback address, so the per-address sign-up limit
// (tested in auth.test.ts) is raised above the 60 this file makes
const ENV = { FLEXSHELF_BCRYPT_COST: '10', FLEXSHELF_SIGNUP_LIMIT: '1000' }

const started: RunningServer[] = []
const folders: string[] = []
afterAll(async () => {
  for (const s of started) await s.stop()
  for (const d of folders) rmSync(d, { recursive: true, force: true })
})

async function start(dataDir?: string): Promise<RunningServer> {
  const server = await startServer(ENV, dataDir ? { dataDir } : { keepData: true })
  started.push(server)
  if (!dataDir) folders.push(server.dataDir)
  return server
}

/** Runs a query on the database file with a connection of its own (as after a crash, before any server opens it). */
function query<T>(file: string, sql: string): Promise<T[]> {
  return new Promise((resolve, reject) => {
    const db = new sqlite3.Database(file, (err) => {
      if (err) return reject(err)
      db.all(sql, (err2, rows) => db.close(() => (err2 ? reject(err2) : resolve(rows as T[]))))
    })
  })
}

interface Outcome {
  acknowledged: Array<{ kind: 'configuration'; id: number; name: string } | { kind: 'account'; email: string }>
  /** HTTP answers other than 2xx (a failure unless it came from the kill). */
  refused: Array<{ status: number; body: string }>
  /** Requests the connection dropped (only expected once the process is killed). */
  dropped: number
}

/**
 * `total` writes with `concurrency` in flight: saved configurations, and every tenth a
 * sign-up (its own transaction with an audit event). `onAck` may kill the server.
 */
async function driveWrites(baseUrl: string, token: string, entryId: number, tag: string, total: number, concurrency: number, onAck?: (n: number) => void): Promise<Outcome> {
  const outcome: Outcome = { acknowledged: [], refused: [], dropped: 0 }
  let next = 0
  async function worker() {
    while (next < total) {
      const i = next++
      const account = i % 10 === 9
      const name = `${tag} ${i}`
      const email = `${tag.replace(/\W+/g, '.')}.${i}@durability.example.test`
      try {
        const res = account
          ? await fetch(`${baseUrl}/api/auth/signup`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: 'durable password', displayName: `Writer ${i}` }) })
          : await fetch(`${baseUrl}/api/configurations`, { method: 'POST', headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` }, body: JSON.stringify({ entryId, name, params: {} }) })
        const text = await res.text()
        if (res.status >= 200 && res.status < 300) {
          if (account) outcome.acknowledged.push({ kind: 'account', email })
          else outcome.acknowledged.push({ kind: 'configuration', id: (JSON.parse(text) as { configuration: { id: number } }).configuration.id, name })
          onAck?.(outcome.acknowledged.length)
        } else {
          outcome.refused.push({ status: res.status, body: text })
        }
      } catch {
        outcome.dropped++
      }
    }
  }
  await Promise.all(Array.from({ length: concurrency }, worker))
  return outcome
}

async function releasedEntryId(baseUrl: string, token: string): Promise<number> {
  const res = await fetch(`${baseUrl}/api/entries`, { headers: { authorization: `Bearer ${token}` } })
  const { entries } = (await res.json()) as { entries: Array<{ id: number; familyId: string; status: string }> }
  return entries.find((e) => e.status === 'released' && e.familyId === 'snap-hook')!.id
}

describe('the server process under concurrent writes', () => {
  it('answers every one of 300 concurrent writes with 2xx, none with "database is locked"', async () => {
    const server = await start()
    const token = await apiSignIn(server.url, 'engineer@demo.flexshelf.test')
    const entryId = await releasedEntryId(server.url, token)
    const outcome = await driveWrites(server.url, token, entryId, 'parallel', 300, 32)
    expect(outcome.refused).toEqual([])
    expect(outcome.dropped).toBe(0)
    expect(outcome.acknowledged).toHaveLength(300)
    expect(server.output()).not.toMatch(/SQLITE_BUSY|database is locked/)
    await server.stop()
  }, 180_000)
})

describe('a SIGKILL in the middle of concurrent writes', () => {
  it('loses no acknowledged write, leaves an intact database, and the server restarts on it', async () => {
    const first = await start()
    const { dataDir } = first
    const token = await apiSignIn(first.url, 'engineer@demo.flexshelf.test')
    const entryId = await releasedEntryId(first.url, token)

    let killing: Promise<void> | null = null
    const outcome = await driveWrites(first.url, token, entryId, 'before kill', 2000, 32, (n) => {
      if (n >= 150 && !killing) killing = first.kill()
    })
    await killing
    expect(killing).not.toBeNull()
    // everything refused before the kill would be a failure; after it, requests only drop
    expect(outcome.refused).toEqual([])
    expect(outcome.dropped).toBeGreaterThan(0)
    expect(outcome.acknowledged.length).toBeGreaterThanOrEqual(150)

    // the file as the crash left it (WAL included), opened by a connection of its own
    const file = join(dataDir, 'flexshelf.sqlite')
    expect(await query<{ integrity_check: string }>(file, 'PRAGMA integrity_check')).toEqual([{ integrity_check: 'ok' }])
    const names = new Set((await query<{ name: string }>(file, 'SELECT name FROM SavedConfigurations')).map((r) => r.name))
    const emails = new Set((await query<{ email: string }>(file, 'SELECT email FROM Users')).map((r) => r.email))
    const missing = outcome.acknowledged.filter((a) => (a.kind === 'configuration' ? !names.has(a.name) : !emails.has(a.email)))
    expect(missing).toEqual([])

    const second = await start(dataDir)
    const token2 = await apiSignIn(second.url, 'engineer@demo.flexshelf.test')
    const listed = (await (await fetch(`${second.url}/api/configurations`, { headers: { authorization: `Bearer ${token2}` } })).json()) as { configurations: Array<{ id: number }> }
    const ids = new Set(listed.configurations.map((c) => c.id))
    for (const a of outcome.acknowledged) if (a.kind === 'configuration') expect(ids.has(a.id)).toBe(true)
    const account = outcome.acknowledged.find((a) => a.kind === 'account')
    if (account && account.kind === 'account') expect((await apiSignIn(second.url, account.email, 'durable password')).length).toBeGreaterThan(20)

    const after = await driveWrites(second.url, token2, entryId, 'after restart', 60, 16)
    expect(after.refused).toEqual([])
    expect(after.acknowledged).toHaveLength(60)
    await second.stop()
    expect(await query<{ integrity_check: string }>(file, 'PRAGMA integrity_check')).toEqual([{ integrity_check: 'ok' }])
  }, 180_000)
})
