/**
 * Benchmark section: the shelf search (catalog/search). For a few windows it reports the
 * median wall time (and the median CPU time of this process, which other work on the
 * machine disturbs less) over the built-in demo shelf and over a synthetic shelf of 200
 * entries (the demo entries repeated with shifted ranges), with and without the exact-method
 * confirmation of the top results, and the candidates considered per second. "Considered"
 * counts every candidate parameter set estimated at least at its nominal point: once an
 * entry already fills the answer, a candidate whose nominal estimate bounds it out is counted
 * without its tolerance band (see engine.ts). Then the raw throughput of each family's fast
 * estimator, and of the full judgement (nominal and band, every candidate banded). The load
 * average is printed before and after: the machine is shared. A benchmark, not a test:
 * medians, no asserts.
 * Targets (issue 6): < 200 ms demo shelf, < 1 s for 200 entries, ≥ 10⁶ candidates per second.
 * Run alone with `npx tsx scripts/bench/search.ts`, or through the bench runner.
 */
import { loadavg } from 'node:os'
import { families } from '../../catalog/index'
import { printerRules } from '../../catalog/printability'
import { DEMO_SHELF, entryGrid, estimatorFor, searchShelfSync, type Shelf, type ShelfEntry } from '../../catalog/search'
import { CandidateJudge } from '../../catalog/search/candidate'
import { GridCursor } from '../../catalog/search/sampling'
import { resolveTolerance } from '../../catalog/tolerance'
import { compileWindow, parseWindow } from '../../catalog/window'

const RUNS = 7

export const WINDOWS: Record<string, unknown> = {
  'bistable switch': { kind: 'bistable', peakForce: { min: 3, max: 8 }, holdingForce: { min: 0.5 }, travel: { max: 8 }, materials: ['petg'], printer: { nozzle: 0.4, layer: 0.2 }, tolerance: { thickness: 0.05, modulus: 0.1 }, limit: 20 },
  'return spring': { kind: 'spring', stiffness: { min: 0.2, max: 0.4 }, travel: { min: 2 }, limit: 20 },
  'door latch': { kind: 'latch', matingForce: { max: 20 }, separationForce: { min: 10 }, limit: 20 },
}

/** The demo entries repeated to `count`, each copy's ranges shifted by up to ±10 % (deterministic). */
export function syntheticShelf(count: number, base: Shelf = DEMO_SHELF): Shelf {
  const out: ShelfEntry[] = []
  for (let i = 0; i < count; i++) {
    const e = base[i % base.length]
    const f = 1 + 0.1 * Math.sin(i * 1.7)
    const ranges = Object.fromEntries(Object.entries(e.ranges).map(([k, [lo, hi]]) => [k, [lo, lo + (hi - lo) * f] as [number, number]]))
    out.push({ ...e, id: `${e.id}#${i}`, name: `${e.name} (${i})`, ranges })
  }
  return out
}

export interface SearchBenchRow {
  window: string
  shelf: string
  entries: number
  confirm: number
  results: number
  considered: number
  medianMs: number
  medianCpuMs: number
  candidatesPerSecond: number
}

export interface EstimatorBenchRow {
  family: string
  method: string
  estimatesPerSecond: number
  /** Candidates judged per second with an open window: rules, nominal and the whole band. */
  bandedPerSecond: number
}

/** PETG's Poisson's ratio under the default wide-beam rule. */
const PETG_BENDING = { poissonRatio: 0.38, wideBeam: 'auto' } as const

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2
}

function timeSearch(name: string, window: unknown, shelfName: string, shelf: Shelf, confirm: number): SearchBenchRow {
  searchShelfSync(window, shelf, { confirm }) // warm-up
  const times: number[] = []
  const cpu: number[] = []
  let last = searchShelfSync(window, shelf, { confirm })
  for (let i = 0; i < RUNS; i++) {
    const c0 = process.cpuUsage()
    last = searchShelfSync(window, shelf, { confirm })
    const c = process.cpuUsage(c0)
    times.push(last.elapsedMs)
    cpu.push((c.user + c.system) / 1000)
  }
  const ms = median(times)
  return { window: name, shelf: shelfName, entries: shelf.length, confirm, results: last.results.length, considered: last.considered, medianMs: ms, medianCpuMs: median(cpu), candidatesPerSecond: last.considered / (ms / 1000) }
}

/** Candidates per second through the full judgement (nominal, then every band corner) over the demo entry's grid. */
function timeBanded(familyId: string): number {
  const family = families.find((f) => f.id === familyId)!
  const entry = DEMO_SHELF.find((e) => e.familyId === familyId)!
  const grid = entryGrid(family, entry, printerRules(), 6000)
  const window = parseWindow({ kind: family.kind })
  const compiled = compileWindow(window)
  const judge = new CandidateJudge({
    family, estimator: estimatorFor(family), modulus: 2000, strainLimit: 0.03, bending: PETG_BENDING, tolerance: resolveTolerance(window.tolerance), compiled, footprint: undefined,
    walls: family.params.filter((p) => p.role === 'wall').map((p) => ({ key: p.key, min: p.min, max: p.max })),
  }, [...compiled.metrics, 'bistable'])
  const pass = () => {
    let n = 0
    const cursor = new GridCursor(grid.axes)
    while (cursor.next()) { judge.judge(cursor.params); n++ }
    return n
  }
  pass()
  const rates: number[] = []
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now()
    const n = pass()
    rates.push(n / ((performance.now() - t0) / 1000))
  }
  return median(rates)
}

/** Single fast estimates per second at the family's demo-entry defaults, varied a little per call. */
function timeEstimator(familyId: string): EstimatorBenchRow | null {
  const family = families.find((f) => f.id === familyId)
  const entry = DEMO_SHELF.find((e) => e.familyId === familyId)
  if (!family || !entry) return null
  const estimator = estimatorFor(family)
  const base = Object.fromEntries(family.params.map((p) => [p.key, typeof entry.defaultParams[p.key] === 'number' ? (entry.defaultParams[p.key] as number) : p.default]))
  const lengthKey = family.params.find((p) => p.role === 'length')!.key
  const params = { ...base }
  let sink = 0
  const n = 200000
  for (let i = 0; i < 2000; i++) estimator.estimate(params, 2000, 0.02, PETG_BENDING)
  const t0 = performance.now()
  for (let i = 0; i < n; i++) {
    params[lengthKey] = base[lengthKey] * (1 + 0.001 * (i % 7))
    const e = estimator.estimate(params, 2000 + (i % 3), 0.02, PETG_BENDING)
    sink += typeof e.safetyFactor === 'number' ? e.safetyFactor : 0
  }
  const s = (performance.now() - t0) / 1000
  if (!Number.isFinite(sink)) throw new Error('non-finite estimate')
  return { family: familyId, method: estimator.method, estimatesPerSecond: n / s, bandedPerSecond: timeBanded(familyId) }
}

export function run(): { searches: SearchBenchRow[]; estimators: EstimatorBenchRow[]; load: { before: number[]; after: number[] } } {
  const before = loadavg()
  const big = syntheticShelf(200)
  const searches: SearchBenchRow[] = []
  for (const [name, window] of Object.entries(WINDOWS)) {
    searches.push(timeSearch(name, window, 'demo', DEMO_SHELF, 0))
    searches.push(timeSearch(name, window, 'demo', DEMO_SHELF, 5))
    searches.push(timeSearch(name, window, 'synthetic', big, 0))
    searches.push(timeSearch(name, window, 'synthetic', big, 5))
  }
  const estimators = families.map((f) => timeEstimator(f.id)).filter((r): r is EstimatorBenchRow => r !== null)
  return { searches, estimators, load: { before, after: loadavg() } }
}

export function format(rows: ReturnType<typeof run>): string {
  const load = (l: number[]) => l.map((v) => v.toFixed(2)).join(' ')
  const lines = [`load average before ${load(rows.load.before)}, after ${load(rows.load.after)} (2 cores, shared)`, '']
  lines.push('window            shelf      entries  confirm  results  considered   median ms  median cpu ms   candidates/s')
  for (const r of rows.searches) {
    lines.push(`${r.window.padEnd(17)} ${r.shelf.padEnd(10)} ${String(r.entries).padStart(7)} ${String(r.confirm).padStart(8)} ${String(r.results).padStart(8)} ${String(r.considered).padStart(11)} ${r.medianMs.toFixed(1).padStart(11)} ${r.medianCpuMs.toFixed(1).padStart(14)} ${r.candidatesPerSecond.toExponential(2).padStart(14)}`)
  }
  const unconfirmed = rows.searches.filter((r) => r.confirm === 0)
  const total = unconfirmed.reduce((n, r) => n + r.considered, 0) / (unconfirmed.reduce((t, r) => t + r.medianMs, 0) / 1000)
  const worst = (shelf: string) => Math.max(...rows.searches.filter((r) => r.shelf === shelf).map((r) => r.medianMs))
  lines.push('', `targets: demo shelf slowest ${worst('demo').toFixed(0)} ms (< 200), 200 entries slowest ${worst('synthetic').toFixed(0)} ms (< 1000), ` +
    `candidates/s over the unconfirmed runs ${total.toExponential(2)} (≥ 1e6)`)
  lines.push('', 'family             fast estimate     estimates/s   judged with band/s')
  for (const r of rows.estimators) lines.push(`${r.family.padEnd(18)} ${r.method.padEnd(17)} ${r.estimatesPerSecond.toExponential(2).padStart(11)} ${r.bandedPerSecond.toExponential(2).padStart(20)}`)
  return lines.join('\n')
}

export const title = 'Shelf search: median time per window (demo and 200-entry shelves) and fast-estimate throughput'

if (process.argv[1] && /bench[\\/]search\.[tj]s$/.test(process.argv[1])) {
  console.log(`${title}\n${format(run())}`)
}
