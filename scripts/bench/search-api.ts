/**
 * Benchmark section: POST /api/search through the real Express app (in-process, supertest,
 * one client, no load): the median time of an answer computed on the search thread, of an
 * answer from the cache, and of a light request (GET /api/health) while a long search runs,
 * against the same light request with nothing running. Medians, no asserts.
 */
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import request from 'supertest'
import { createApp } from '../../api/app'
import { loadConfig } from '../../api/config'
import { openDatabase } from '../../api/db'
import { DEMO_PASSWORD } from '../../api/db/demo-shelf'
import { seedDemoData } from '../../api/db/seed'
import { sharedSearchPool } from '../../api/services/search'
import { WINDOWS } from './search'

const RUNS = 7
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]

async function timed(fn: () => Promise<unknown>): Promise<number> {
  const t0 = performance.now()
  await fn()
  return performance.now() - t0
}

export const title = 'Search API: POST /api/search in-process, one client (medians)'

export async function run() {
  const dir = mkdtempSync(join(tmpdir(), 'flexshelf-bench-'))
  const config = loadConfig({ FLEXSHELF_DATA: dir }, { bcryptCost: 4, webDir: join(dir, 'none') })
  const db = await openDatabase(config.databaseFile)
  const context = { config, db }
  await seedDemoData(context)
  const app = createApp(context, { log: () => undefined })
  const signin = await request(app).post('/api/auth/signin').send({ email: 'engineer@demo.flexshelf.test', password: DEMO_PASSWORD })
  const auth = { Authorization: `Bearer ${signin.body.token}` }
  const rows: Array<Record<string, unknown>> = []
  // the first search starts the thread; it is not counted
  await request(app).post('/api/search').set(auth).send({ kind: 'spring', stiffness: { min: 0.1 } })
  for (const [name, window] of Object.entries(WINDOWS)) {
    const computed: number[] = []
    const cached: number[] = []
    for (let i = 0; i < RUNS; i++) {
      // a different limit is a different window: a cache miss each time
      const fresh = { ...(window as object), limit: 20 + i }
      computed.push(await timed(() => request(app).post('/api/search').set(auth).send(fresh).expect(200)))
      cached.push(await timed(() => request(app).post('/api/search').set(auth).send(fresh).expect(200)))
    }
    rows.push({ window: name, computedMs: median(computed), cachedMs: median(cached) })
  }
  // a light request beside a long search (200 more released entries), and alone
  const { Entry } = db.models
  const seeds = await Entry.findAll({ where: { status: 'released', familyId: 'bistable-beam' } })
  await Entry.bulkCreate(Array.from({ length: 200 }, (_, i) => {
    const s = seeds[i % seeds.length]
    return { familyId: s.familyId, name: `${s.name} bench ${i}`, summary: '', tags: [], status: 'released' as const, defaultParams: s.defaultParams, ranges: s.ranges, materials: s.materials, notes: '', ownerId: s.ownerId, currentRevisionId: null }
  }))
  const alone: number[] = []
  for (let i = 0; i < 20; i++) alone.push(await timed(() => request(app).get('/api/health')))
  let searchMs = 0
  const long = timed(() => request(app).post('/api/search').set(auth).send({ kind: 'bistable', peakForce: { min: 2, max: 9 } })).then((ms) => { searchMs = ms })
  const beside: number[] = []
  let done = false
  void long.then(() => { done = true })
  while (!done) beside.push(await timed(() => request(app).get('/api/health')))
  await long
  rows.push({ window: `GET /api/health alone / beside a ${Math.round(searchMs)} ms search of 204 entries`, computedMs: median(alone), cachedMs: median(beside) })
  await sharedSearchPool().close()
  await db.close()
  rmSync(dir, { recursive: true, force: true })
  return rows
}

export function format(rows: Array<Record<string, unknown>>): string {
  const lines = ['| window | computed on the search thread, ms | from the cache, ms |', '|---|---|---|']
  for (const r of rows.slice(0, -1)) lines.push(`| ${r.window} | ${Number(r.computedMs).toFixed(1)} | ${Number(r.cachedMs).toFixed(1)} |`)
  const last = rows[rows.length - 1]
  lines.push('', `${last.window}: ${Number(last.computedMs).toFixed(1)} ms alone, ${Number(last.cachedMs).toFixed(1)} ms beside it (median)`)
  return lines.join('\n')
}
