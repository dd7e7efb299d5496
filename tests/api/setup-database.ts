/**
 * Setup of the `api` test project. With FLEXSHELF_TEST_DATABASE_URL set (npm run test:pg),
 * every database a test opens is a PostgreSQL database instead of an SQLite file: the file
 * path a test passes names its own database (created on first connection), so a test that
 * reopens the same file reopens the same data and every fresh temporary folder gets a fresh,
 * empty database. The code under test goes through the real PostgreSQL path of openSequelize.
 */
import { createHash } from 'node:crypto'
import { vi } from 'vitest'

const adminUrl = process.env.FLEXSHELF_TEST_DATABASE_URL

if (adminUrl) {
  vi.doMock('../../api/db/connection', async (importOriginal) => {
    const original = await importOriginal<typeof import('../../api/db/connection')>()
    const pg = (await import('pg')).default
    const created = new Map<string, Promise<void>>()
    const ensureDatabase = (name: string) => {
      let ready = created.get(name)
      if (!ready) {
        ready = (async () => {
          const client = new pg.Client({ connectionString: adminUrl })
          await client.connect()
          try {
            await client.query(`CREATE DATABASE "${name}"`)
          } catch (err) {
            if ((err as { code?: string }).code !== '42P04') throw err // 42P04: it exists already
          } finally {
            await client.end()
          }
        })()
        created.set(name, ready)
      }
      return ready
    }
    return {
      ...original,
      openSequelize(target: string, options: Parameters<typeof original.openSequelize>[1] = {}) {
        if (original.isPostgresUrl(target)) return original.openSequelize(target, options)
        const name = 'fs_' + createHash('sha256').update(target).digest('hex').slice(0, 24)
        const url = new URL(adminUrl)
        url.pathname = '/' + name
        return original.openSequelize(url.href, { ...options, beforeConnect: () => ensureDatabase(name) })
      },
    }
  })
}
