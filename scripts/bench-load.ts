/**
 * Load benchmark (`npm run bench:load`): starts the real server on loopback over a fresh data
 * folder with the demo shelf, drives it with autocannon and prints, per scenario, requests per
 * second, p50/p99 latency and errors — then the shelf list while heavy requests (evaluations,
 * searches, STL downloads, sign-ins) run beside it, once with the compute pool and once with
 * every computation on the request thread, to show what the pool buys.
 *
 *   npm run bench:load                              # 3 passes, 5 s per scenario, medians
 *   npm run bench:load -- --duration 10 --runs 5    # longer
 *   npm run bench:load -- --arrangement             # two instances and two workers (README, "Running on several machines")
 *
 * Targets (issue 8, this 2-core machine): shelf list ≥ 1000 req/s at 50 connections with
 * p99 < 100 ms and no errors. Reports, asserts nothing; README.md "Performance" keeps the
 * medians of a few runs.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { availableParallelism, tmpdir } from 'node:os'
import { join } from 'node:path'
import autocannon, { type Options, type Result } from 'autocannon'
import { freePort } from './support/free-port'

const PASSWORD = 'flexshelf-demo'

interface Server {
  url: string
  stop: () => Promise<void>
}


async function startServer(env: Record<string, string>): Promise<Server> {
  const dataDir = mkdtempSync(join(tmpdir(), 'flexshelf-bench-'))
  const port = await freePort()
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'api/server.ts'], {
    env: { ...process.env, NODE_ENV: 'development', PORT: String(port), FLEXSHELF_DATA: dataDir, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let output = ''
  child.stdout?.on('data', (d) => { output += String(d) })
  child.stderr?.on('data', (d) => { output += String(d) })
  const url = `http://127.0.0.1:${port}`
  const deadline = Date.now() + 120_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited (${child.exitCode}):\n${output}`)
    try {
      if ((await fetch(`${url}/api/health`)).ok) break
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`server did not start:\n${output}`)
    await new Promise((r) => setTimeout(r, 250))
  }
  return {
    url,
    stop: async () => {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r))
        child.kill('SIGTERM')
        await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))])
        if (child.exitCode === null) child.kill('SIGKILL')
      }
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}

async function signIn(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/signin`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD }) })
  if (!res.ok) throw new Error(`sign-in answered ${res.status}`)
  return ((await res.json()) as { token: string }).token
}

interface Fixture {
  token: string
  shelfEntryId: number
  stlEntryId: number
}

async function fixture(url: string): Promise<Fixture> {
  const token = await signIn(url, 'engineer@demo.flexshelf.test')
  const res = await fetch(`${url}/api/entries`, { headers: { authorization: `Bearer ${token}` } })
  const { entries } = (await res.json()) as { entries: Array<{ id: number; familyId: string; status: string }> }
  const released = entries.filter((e) => e.status === 'released')
  return {
    token,
    shelfEntryId: released[0].id,
    // a bistable frame: its JSCAD booleans take a few hundred ms, the heaviest STL on the shelf
    stlEntryId: (released.find((e) => e.familyId === 'bistable-beam') ?? released[0]).id,
  }
}

type Scenario = { name: string; connections: number; options: (url: string, f: Fixture) => Omit<Partial<Options>, 'url'> & { path: string } }

const json = (token: string) => ({ authorization: `Bearer ${token}`, 'content-type': 'application/json' })

let searchCounter = 0
const SCENARIOS: Record<string, Scenario> = {
  shelf: { name: 'shelf list (GET /api/entries)', connections: 50, options: (_u, f) => ({ path: '/api/entries', headers: json(f.token) }) },
  entry: { name: 'entry page data (GET /api/entries/:id)', connections: 50, options: (_u, f) => ({ path: `/api/entries/${f.shelfEntryId}`, headers: json(f.token) }) },
  evaluate: {
    name: 'evaluation (bistable, nonlinear-fe)', connections: 8,
    options: (_u, f) => ({ path: '/api/families/bistable-beam/evaluate', method: 'POST', headers: json(f.token), body: JSON.stringify({ params: {} }) }),
  },
  search: {
    name: 'search (POST /api/search, uncached windows)', connections: 2,
    options: (_u, f) => ({
      path: '/api/search', method: 'POST', headers: json(f.token),
      // every request a window of its own, so the answer cache never serves it
      requests: [{ setupRequest: (req: Record<string, unknown>) => ({ ...req, body: JSON.stringify({ kind: 'spring', stiffness: { min: 0.05, max: 1 + (++searchCounter % 100000) / 1e5 }, limit: 5 }) }) }],
    }),
  },
  stl: { name: 'STL download (bistable frame)', connections: 2, options: (_u, f) => ({ path: `/api/entries/${f.stlEntryId}/stl`, headers: json(f.token) }) },
  signin: {
    name: 'sign-in (bcrypt)', connections: 2,
    options: () => ({ path: '/api/auth/signin', method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'contributor@demo.flexshelf.test', password: PASSWORD }) }),
  },
}

interface Row {
  scenario: string
  conns: number
  'req/s': number
  'p50 ms': number
  'p99 ms': number
  errors: number
}

function row(name: string, connections: number, r: Result): Row {
  return {
    scenario: name,
    conns: connections,
    'req/s': Math.round(r.requests.average),
    'p50 ms': r.latency.p50,
    'p99 ms': r.latency.p99,
    errors: r.errors + r.timeouts + r.non2xx,
  }
}

function drive(url: string, f: Fixture, scenario: Scenario, duration: number): Promise<Result> {
  // autocannon takes the path as part of the URL (a top-level `path` option is ignored)
  const { path, ...options } = scenario.options(url, f)
  return autocannon({ connections: scenario.connections, duration, timeout: 30, ...options, url: `${url}${path}` })
}

function table(rows: Row[]): string {
  const keys = Object.keys(rows[0]) as Array<keyof Row>
  const widths = keys.map((k) => Math.max(k.length, ...rows.map((r) => String(r[k]).length)))
  const line = (values: string[]) => values.map((v, i) => (i === 0 ? v.padEnd(widths[i]) : v.padStart(widths[i]))).join('  ')
  return [line(keys), line(widths.map((w) => '-'.repeat(w))), ...rows.map((r) => line(keys.map((k) => String(r[k]))))].join('\n')
}

/** The shelf list at 50 connections while every heavy scenario runs beside it. */
async function mixed(url: string, f: Fixture, duration: number, label: string): Promise<Row[]> {
  const heavy = ['evaluate', 'search', 'stl', 'signin'].map((k) => SCENARIOS[k])
  const [shelf, ...others] = await Promise.all([drive(url, f, SCENARIOS.shelf, duration), ...heavy.map((s) => drive(url, f, s, duration))])
  return [row(`shelf list beside heavy requests (${label})`, 50, shelf), ...others.map((r, i) => row(`  beside: ${heavy[i].name}`, heavy[i].connections, r))]
}

function option(name: string, fallback: number): number {
  const at = process.argv.indexOf(name)
  const value = at > 0 ? Number(process.argv[at + 1]) : fallback
  if (!Number.isFinite(value) || value <= 0) throw new Error('usage: npm run bench:load [-- --duration <seconds>] [--runs <n>]')
  return value
}

/** One pass over every scenario: a fresh server with the compute pool, then one without. */
async function pass(duration: number): Promise<Row[]> {
  const rows: Row[] = []
  const pooled = await startServer({})
  try {
    const f = await fixture(pooled.url)
    // warm up: compute threads load the catalog, the search threads their tables
    await Promise.all(['evaluate', 'stl', 'search', 'shelf'].map((k) => drive(pooled.url, f, SCENARIOS[k], 2)))
    for (const key of ['shelf', 'entry', 'evaluate', 'search', 'stl', 'signin']) {
      rows.push(row(SCENARIOS[key].name, SCENARIOS[key].connections, await drive(pooled.url, f, SCENARIOS[key], duration)))
    }
    rows.push(...(await mixed(pooled.url, f, duration, 'compute pool')))
  } finally {
    await pooled.stop()
  }

  // the same mix with every evaluation, STL and bcrypt on the request thread (searches keep their own threads)
  const single = await startServer({ FLEXSHELF_COMPUTE_THREADS: '0' })
  try {
    const f = await fixture(single.url)
    await Promise.all(['evaluate', 'stl', 'shelf'].map((k) => drive(single.url, f, SCENARIOS[k], 2)))
    rows.push(...(await mixed(single.url, f, duration, 'no compute pool')))
  } finally {
    await single.stop()
  }
  return rows
}

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2
}

async function main(): Promise<void> {
  const duration = option('--duration', 5)
  const runs = option('--runs', 3)
  const passes: Row[][] = []
  for (let i = 0; i < runs; i++) {
    passes.push(await pass(duration))
    console.error(`pass ${i + 1} of ${runs} done`)
  }
  // each cell is the median over the passes
  const rows = passes[0].map((first, r) => {
    const cell = (k: keyof Row) => median(passes.map((p) => p[r][k] as number))
    return { ...first, 'req/s': cell('req/s'), 'p50 ms': cell('p50 ms'), 'p99 ms': cell('p99 ms'), errors: cell('errors') }
  })
  console.log(`\nFlexshelf load benchmark: medians of ${runs} passes, ${duration} s per scenario, loopback, ${availableParallelism()} cores, Node ${process.version}\n`)
  console.log(table(rows))
}

if (process.argv.includes('--arrangement')) {
  // several instances and workers on PostgreSQL, Redis and the S3 fake (scripts/bench/arrangement.ts)
  await import('./bench/arrangement')
} else {
  main().catch((err) => {
    console.error(err)
    process.exit(1)
  })
}
