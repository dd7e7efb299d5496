/**
 * `npm run backup`: a consistent copy of the live database and the uploads, taken while the
 * server runs.
 *
 *   FLEXSHELF_DATA=/srv/flexshelf npm run backup            # → <data>/backups/flexshelf-<time>.sqlite (+ -uploads/)
 *   npm run backup -- --out /mnt/offsite                     # another folder
 *
 * The database is copied with SQLite's VACUUM INTO, which reads one transaction-consistent
 * snapshot (WAL included) without stopping writers, and writes a compact file with no WAL of
 * its own. The uploads are copied after it, so every file the snapshot refers to is there
 * (files are written before the row that names them is committed, and never changed).
 * The JWT secret file is left out on purpose: a restored server issues new sessions.
 * Restore: README.md, "Backup and restore".
 */
import { cpSync, existsSync, mkdirSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import sqlite3 from 'sqlite3'

const projectRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..')

function run(db: sqlite3.Database, sql: string): Promise<void> {
  return new Promise((ok, fail) => db.exec(sql, (err) => (err ? fail(err) : ok())))
}

function open(file: string, mode: number): Promise<sqlite3.Database> {
  return new Promise((ok, fail) => {
    const db = new sqlite3.Database(file, mode, (err) => (err ? fail(err) : ok(db)))
  })
}

function close(db: sqlite3.Database): Promise<void> {
  return new Promise((ok, fail) => db.close((err) => (err ? fail(err) : ok())))
}

async function integrity(file: string): Promise<string> {
  const db = await open(file, sqlite3.OPEN_READONLY)
  try {
    return await new Promise((ok, fail) => db.get('PRAGMA integrity_check', (err, row: { integrity_check: string }) => (err ? fail(err) : ok(row.integrity_check))))
  } finally {
    await close(db)
  }
}

export async function backup(dataDir: string, outDir = join(dataDir, 'backups'), now = new Date()): Promise<{ database: string; uploads: string | null }> {
  const source = join(dataDir, 'flexshelf.sqlite')
  if (!existsSync(source)) throw new Error(`no database at ${source} (set FLEXSHELF_DATA to the server's data folder)`)
  mkdirSync(outDir, { recursive: true })
  const stamp = now.toISOString().replace(/[:.]/g, '-')
  const database = join(outDir, `flexshelf-${stamp}.sqlite`)
  if (existsSync(database)) throw new Error(`${database} exists already`)

  const db = await open(source, sqlite3.OPEN_READWRITE)
  try {
    // wait for the server's writer rather than fail while it commits
    await run(db, 'PRAGMA busy_timeout = 10000')
    await run(db, `VACUUM INTO '${database.replace(/'/g, "''")}'`)
  } finally {
    await close(db)
  }
  const check = await integrity(database)
  if (check !== 'ok') throw new Error(`the copy failed its integrity check: ${check}`)

  const uploadsDir = join(dataDir, 'uploads')
  let uploads: string | null = null
  if (existsSync(uploadsDir)) {
    uploads = join(outDir, `flexshelf-${stamp}-uploads`)
    cpSync(uploadsDir, uploads, { recursive: true, errorOnExist: true })
  }
  return { database, uploads }
}

async function main(): Promise<void> {
  const args = process.argv.slice(2)
  const outAt = args.indexOf('--out')
  if (args.some((a, i) => a !== '--out' && i !== outAt + 1) || (outAt >= 0 && !args[outAt + 1])) {
    throw new Error('usage: npm run backup [-- --out <folder>]')
  }
  const dataDir = resolve(process.env.FLEXSHELF_DATA || join(projectRoot, 'data'))
  const out = outAt >= 0 ? resolve(args[outAt + 1]) : undefined
  const result = await backup(dataDir, out)
  console.log(`Database backed up to ${result.database} (integrity check ok)`)
  console.log(result.uploads ? `Uploads copied to ${result.uploads}` : 'No uploads folder to copy')
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((err) => {
    console.error(`Backup failed: ${(err as Error).message}`)
    process.exit(1)
  })
}
