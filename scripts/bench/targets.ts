/**
 * Benchmark section: the speed targets as ratios against plain references timed in the same
 * run, so that a loaded machine moves both sides alike.
 * - A plain JavaScript loop over the two-mode closed form of the bistable pair (Qiu, Lang &
 *   Slocum 2004: peak and valley force per candidate from typed arrays), timed before every
 *   search run: the search must estimate at least 1/20 of its median rate, tolerance band
 *   included.
 * - A plain reference beam solver (scripts/bench/reference/plain-beam.ts: 20 textbook
 *   corotational elements per half beam, 100 steps, Newton): Flexshelf's exact curve
 *   (Richardson from 20 and 10 elements) must take no longer than it, and a 200-entry shelf
 *   no longer than 30 of its curves.
 * - A 2,000-entry shelf under 1 s of wall time.
 * - Every file of a module (STL, and the other formats the catalog writes) under 30 ms.
 * Times are medians; the reference and the measured side alternate run by run; CPU time
 * of this process is shown beside wall time, as the machine is shared. Asserts nothing.
 */
import { loadavg } from 'node:os'
import { buildGeometry, buildPartFile, clearSolidCache, families, PART_FORMATS, serializeStl, type PartFormat } from '../../catalog/index'
import type { FamilyDefinition } from '../../catalog/schema/types'
import { closedFormMetrics } from '../../catalog/families/bistable-beam/closed-form'
import { snapMetrics } from '../../catalog/families/bistable-beam/curve-metrics'
import { solveBistableCurve, type BistableGeometry } from '../../catalog/families/bistable-beam/fe-model'
import { DEMO_SHELF, searchShelfSync } from '../../catalog/search'
import { solvePlainReference } from './reference/plain-beam'
import { syntheticShelf, WINDOWS } from './search'

const CURVE_CASES: BistableGeometry[] = [
  { span: 40, apexHeight: 3, thickness: 0.6, depth: 5, postLength: 0, modulus: 2000 },
  { span: 100, apexHeight: 8, thickness: 0.8, depth: 5, postLength: 0, modulus: 2000 },
  { span: 30, apexHeight: 3.6, thickness: 1.2, depth: 5, postLength: 0, modulus: 2000 },
  { span: 60, apexHeight: 4.8, thickness: 0.8, depth: 5, postLength: 0, modulus: 2000 },
]
const CURVE_RUNS = 15

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

function timed(fn: () => void): { wall: number; cpu: number } {
  const c0 = process.cpuUsage()
  const t0 = performance.now()
  fn()
  const wall = performance.now() - t0
  const c = process.cpuUsage(c0)
  return { wall, cpu: (c.user + c.system) / 1000 }
}

const PI4 = Math.PI ** 4

/**
 * The plain loop: per candidate (span, apex height, thickness, modulus, depth from typed
 * arrays), Q = h/t and the two-mode peak and valley written out (Qiu, Lang & Slocum 2004:
 * f1 = 2π⁴Δ + (3/2)π⁴Q²Δ(1 − Δ)(2 − Δ) up to the mode-3 line f3 = 8π⁴ − 6π⁴Δ, which it meets
 * at Δ = 1 ∓ √(1 − 16/(3Q²)); the turns of f1 at Δ = 1 ∓ √(1/3 − 4/(9Q²))), scaled to newtons
 * for the pair. What a hand-written loop over one closed form costs: the floor of the rate.
 */
function closedFormLoop(): { n: number; pass: () => void } {
  const n = 1 << 18
  const span = new Float64Array(n), h = new Float64Array(n), t = new Float64Array(n), E = new Float64Array(n), b = new Float64Array(n)
  const peak = new Float64Array(n), valley = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    span[i] = 30 + (i % 71); h[i] = 1 + (i % 13) * 0.5; t[i] = 0.5 + (i % 7) * 0.1; E[i] = 1800 + (i % 5) * 100; b[i] = 4 + (i % 3)
  }
  const f1 = (q: number, d: number) => 2 * PI4 * d + 1.5 * PI4 * q * q * d * (1 - d) * (2 - d)
  const pass = () => {
    for (let i = 0; i < n; i++) {
      const q = h[i] / t[i]
      const d3 = 1 - 16 / (3 * q * q)
      const d1 = 1 / 3 - 4 / (9 * q * q)
      const turn = d1 > 0 ? Math.sqrt(d1) : -1
      let p: number, v: number
      if (d3 >= 0) {
        const s = Math.sqrt(d3)
        p = turn > 0 && 1 - turn < 1 - s ? f1(q, 1 - turn) : 8 * PI4 - 6 * PI4 * (1 - s)
        v = turn > 0 && 1 + turn > 1 + s ? f1(q, 1 + turn) : 8 * PI4 - 6 * PI4 * (1 + s)
      } else if (turn > 0) {
        p = f1(q, 1 - turn)
        v = f1(q, 1 + turn)
      } else {
        p = v = f1(q, 2)
      }
      const scale = (2 * E[i] * ((b[i] * t[i] * t[i] * t[i]) / 12) * h[i]) / (span[i] * span[i] * span[i])
      peak[i] = p * scale
      valley[i] = v * scale
    }
  }
  pass()
  // the same numbers as the catalog's closed form (a check that the loop computes what it says)
  for (const i of [0, 1, 7, 100, n - 1]) {
    const m = closedFormMetrics(h[i] / t[i])
    const scale = (2 * E[i] * ((b[i] * t[i] ** 3) / 12) * h[i]) / span[i] ** 3
    if (Math.abs(m.peak * scale - peak[i]) > 1e-9 * Math.abs(peak[i]) || Math.abs(m.valley * scale - valley[i]) > 1e-9 * Math.abs(peak[i])) throw new Error('the plain closed-form loop disagrees with closedFormMetrics')
  }
  return { n, pass }
}

/**
 * The closed-form loop timed beside the searches: three passes before every timed search run
 * (their rates kept), so that the loop and the search meet the same load, as the curves'
 * reference and solver do. Timed once at the start, a passing burst of other work moved the
 * loop's rate by half as much again between two runs.
 */
class ClosedFormClock {
  private readonly loop = closedFormLoop()
  readonly rates: number[] = []
  constructor() { for (let k = 0; k < 5; k++) this.loop.pass() }
  tick(): void { for (let k = 0; k < 3; k++) this.rates.push(this.loop.n / (timed(this.loop.pass).cpu / 1000)) }
  rate(): number { return median(this.rates) }
}

export interface CurveRow { case: string; plainMs: number; plainCpuMs: number; plainPeakErrPct: number; plainValleyErrPct: number; flexshelfMs: number; flexshelfCpuMs: number; flexshelfPeakErrPct: number; flexshelfValleyErrPct: number; ratio: number }

function curveRows(): CurveRow[] {
  const rows: CurveRow[] = []
  for (const g of CURVE_CASES) {
    for (let i = 0; i < 3; i++) { solvePlainReference(g); solveBistableCurve(g) }
    const plain: Array<{ wall: number; cpu: number }> = [], flex: Array<{ wall: number; cpu: number }> = []
    for (let i = 0; i < CURVE_RUNS; i++) {
      plain.push(timed(() => solvePlainReference(g)))
      flex.push(timed(() => solveBistableCurve(g)))
    }
    // mesh-converged values: Richardson from 320 and 160 elements (the bistable bench's reference)
    const converged = solveBistableCurve(g, 320)
    const ref = snapMetrics(converged.displacement, converged.force)
    const p = solvePlainReference(g)
    const f = solveBistableCurve(g)
    const fm = snapMetrics(f.displacement, f.force)
    const err = (v: number, r: number) => (100 * Math.abs(v - r)) / Math.abs(r)
    const plainMs = median(plain.map((x) => x.wall)), flexshelfMs = median(flex.map((x) => x.wall))
    const plainCpuMs = median(plain.map((x) => x.cpu)), flexshelfCpuMs = median(flex.map((x) => x.cpu))
    rows.push({
      case: `span ${g.span} h ${g.apexHeight} t ${g.thickness}`,
      plainMs, plainCpuMs, plainPeakErrPct: err(p.peakForce, ref.peakForce), plainValleyErrPct: err(p.valleyForce, ref.valleyForce),
      flexshelfMs, flexshelfCpuMs, flexshelfPeakErrPct: err(fm.peakForce, ref.peakForce), flexshelfValleyErrPct: err(fm.valleyForce, ref.valleyForce),
      ratio: flexshelfCpuMs / plainCpuMs,
    })
  }
  return rows
}

interface ShelfRow { window: string; entries: number; medianMs: number; medianCpuMs: number; considered: number; candidatesPerSecond: number }

function shelfRows(entries: number, runs: number, clock: ClosedFormClock): ShelfRow[] {
  const shelf = entries === DEMO_SHELF.length ? DEMO_SHELF : syntheticShelf(entries)
  return Object.entries(WINDOWS).map(([name, window]) => {
    searchShelfSync(window, shelf, { confirm: 0 })
    const wall: number[] = [], cpu: number[] = []
    let considered = 0
    for (let i = 0; i < runs; i++) {
      let answer: ReturnType<typeof searchShelfSync> | null = null
      clock.tick()
      const t = timed(() => { answer = searchShelfSync(window, shelf, { confirm: 0 }) })
      wall.push(t.wall)
      cpu.push(t.cpu)
      considered = answer!.considered
    }
    const medianMs = median(wall)
    return { window: name, entries, medianMs, medianCpuMs: median(cpu), considered, candidatesPerSecond: considered / (medianMs / 1000) }
  })
}

interface FileRow { family: string; ms: Record<string, number> }

/**
 * Median time of each file of a module at its defaults, from validated parameters to bytes:
 * built from scratch (the solid cache emptied before each), and the same file again with the
 * solid cached (a second format of the same part, or the same download twice). Three builds
 * warm each writer first, so the times are those of a running server, not of its first part.
 */
function buildFiles(list: readonly FamilyDefinition[]): FileRow[] {
  return list.map((family) => {
    const params = Object.fromEntries(family.params.map((p) => [p.key, p.default]))
    const writers: Record<string, () => unknown> = {
      stl: () => serializeStl(buildGeometry(family.id, params)),
      ...Object.fromEntries((Object.keys(PART_FORMATS) as PartFormat[]).map((format) => [format, () => buildPartFile(format, family.id, params, { name: family.name })])),
    }
    const ms: Record<string, number> = {}
    for (const [name, write] of Object.entries(writers)) {
      // warm, as in a server that has written a few parts: the first builds run before the JIT has compiled the build
      for (let i = 0; i < 3; i++) { clearSolidCache(); write() }
      const fresh: number[] = [], cached: number[] = []
      for (let i = 0; i < 7; i++) {
        clearSolidCache()
        fresh.push(timed(() => write()).wall)
        cached.push(timed(() => write()).wall)
      }
      ms[name] = median(fresh)
      ms[`${name} cached`] = median(cached)
    }
    return { family: family.id, ms }
  })
}

export function run() {
  const load = { before: loadavg(), after: [] as number[] }
  const clock = new ClosedFormClock()
  const curves = curveRows()
  const demo = shelfRows(DEMO_SHELF.length, 7, clock)
  const two = shelfRows(200, 5, clock)
  const twoThousand = shelfRows(2000, 3, clock)
  const closedForm = clock.rate()
  const files = buildFiles(families)
  load.after = loadavg()
  return { load, closedForm, curves, demo, two, twoThousand, files }
}

export function format(r: ReturnType<typeof run>): string {
  const e = (v: number) => v.toExponential(2)
  const f = (v: number, d = 1) => v.toFixed(d)
  const lines = [`load average before ${r.load.before.map((v) => v.toFixed(2)).join(' ')}, after ${r.load.after.map((v) => v.toFixed(2)).join(' ')} (2 cores, shared with other work)`, '']
  lines.push('exact bistable curve against the plain reference (medians over alternating runs; errors against Richardson from 320 and 160 elements)')
  lines.push('case                          plain ms  cpu ms  peak %  valley %   flexshelf ms  cpu ms  peak %  valley %   cpu ratio')
  for (const c of r.curves) {
    lines.push(`${c.case.padEnd(28)} ${f(c.plainMs).padStart(9)} ${f(c.plainCpuMs).padStart(7)} ${f(c.plainPeakErrPct, 3).padStart(7)} ${f(c.plainValleyErrPct, 3).padStart(9)}   ${f(c.flexshelfMs).padStart(12)} ${f(c.flexshelfCpuMs).padStart(7)} ${f(c.flexshelfPeakErrPct, 3).padStart(7)} ${f(c.flexshelfValleyErrPct, 3).padStart(9)}   ${f(c.ratio, 2).padStart(9)}`)
  }
  lines.push('', 'shelf searches without confirmation (the band included)')
  lines.push('window            entries   median ms  median cpu ms  considered  candidates/s')
  for (const s of [...r.demo, ...r.two, ...r.twoThousand]) {
    lines.push(`${s.window.padEnd(17)} ${String(s.entries).padStart(7)} ${f(s.medianMs).padStart(11)} ${f(s.medianCpuMs).padStart(14)} ${String(s.considered).padStart(11)} ${e(s.candidatesPerSecond).padStart(13)}`)
  }
  lines.push('', 'files of a module at its defaults, built from scratch (the cache emptied), median ms')
  const formats = Object.keys(r.files[0]?.ms ?? {})
  lines.push(`family              ${formats.map((k) => k.padStart(12)).join('')}`)
  for (const row of r.files) lines.push(`${row.family.padEnd(19)} ${formats.map((k) => f(row.ms[k]).padStart(12)).join('')}`)

  // rates and the curve comparison on CPU time: the machine is shared, and both sides are timed alike
  const rate = (rows: ShelfRow[]) => rows.reduce((n, s) => n + s.considered, 0) / (rows.reduce((t, s) => t + s.medianCpuMs, 0) / 1000)
  const searchRate = rate([...r.two, ...r.twoThousand])
  const plainCurve = median(r.curves.map((c) => c.plainCpuMs))
  const worst = (rows: ShelfRow[], cpu = false) => Math.max(...rows.map((s) => (cpu ? s.medianCpuMs : s.medianMs)))
  const worstCurveRatio = Math.max(...r.curves.map((c) => c.ratio))
  const slowestFile = Math.max(...r.files.flatMap((row) => Object.entries(row.ms).filter(([k]) => !k.endsWith('cached')).map(([, v]) => v)))
  const mark = (ok: boolean) => (ok ? 'met' : 'NOT met')
  lines.push('', 'targets (issue 17), each against its reference timed above:')
  lines.push(`  search estimates ${e(searchRate)} per CPU second over the 200- and 2,000-entry runs vs the closed-form loop ${e(r.closedForm)} (median of the passes timed before each search run): 1/${f(r.closedForm / searchRate, 1)} (at least 1/20): ${mark(searchRate * 20 >= r.closedForm)}`)
  lines.push(`  200-entry shelf slowest ${f(worst(r.two, true), 0)} ms CPU = ${f(worst(r.two, true) / plainCurve, 1)} plain reference curves of ${f(plainCurve, 1)} ms CPU (at most 30): ${mark(worst(r.two, true) <= 30 * plainCurve)}`)
  lines.push(`  2,000-entry shelf slowest ${f(worst(r.twoThousand), 0)} ms wall, ${f(worst(r.twoThousand, true), 0)} ms CPU (under 1000 wall): ${mark(worst(r.twoThousand) < 1000)}`)
  lines.push(`  exact bistable curve / plain reference, CPU time, worst case ${f(worstCurveRatio, 2)} (at most 1): ${mark(worstCurveRatio <= 1)}`)
  lines.push(`  slowest file built from scratch ${f(slowestFile, 1)} ms wall (under 30): ${mark(slowestFile < 30)}`)
  return lines.join('\n')
}

export const title = 'Speed targets against plain references timed in the same run'

if (process.argv[1] && /bench[\\/]targets\.[tj]s$/.test(process.argv[1])) {
  console.log(`${title}\n${format(run())}`)
}
