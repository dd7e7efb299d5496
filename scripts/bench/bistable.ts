/**
 * Benchmark section: the bistable curved-beam pair. For a table of cases: median time of one
 * full nonlinear curve as the family computes it (≥ 101 points to 2·apexHeight; Richardson
 * extrapolation from the default mesh and half of it), wall clock and CPU time; its peak and
 * valley error, each against its own mesh-converged value (Richardson from 160 and 320
 * elements), next to the valley error of the single default mesh; closed-form and
 * table-interpolation evaluations per second; then the table's interpolation error against
 * direct solves (all metrics, over the family's ranges). Prints the load average, since the machine is shared. Asserts nothing.
 */
import { availableParallelism, loadavg } from 'node:os'
import { closedFormMetrics } from '../../catalog/families/bistable-beam/closed-form'
import { snapMetrics } from '../../catalog/families/bistable-beam/curve-metrics'
import { bistableTableTolerance, estimateBistable } from '../../catalog/families/bistable-beam/estimate'
import { FE_ELEMENTS, solveBistableCurve, solveBistableFe, type BistableGeometry } from '../../catalog/families/bistable-beam/fe-model'
import { bistableTable } from '../../catalog/families/bistable-beam/table-store'
import { caseErrors, validationCases } from '../../catalog/families/bistable-beam/table-validation'

const CASES: Array<{ label: string; g: BistableGeometry }> = [
  { label: 'defaults (Q 3.1)', g: { span: 60, apexHeight: 2.5, thickness: 0.8, depth: 6, postLength: 0, modulus: 2000 } },
  { label: 'CLI example (Q 5)', g: { span: 40, apexHeight: 3, thickness: 0.6, depth: 5, postLength: 0, modulus: 2000 } },
  { label: 'near critical (Q 2.5)', g: { span: 50, apexHeight: 2, thickness: 0.8, depth: 5, postLength: 0, modulus: 2000 } },
  { label: 'tall (Q 10)', g: { span: 100, apexHeight: 8, thickness: 0.8, depth: 5, postLength: 0, modulus: 2000 } },
  { label: 'side posts 3 mm (Q 6)', g: { span: 60, apexHeight: 4.8, thickness: 0.8, depth: 5, postLength: 3, modulus: 2000 } },
  { label: 'thick (span/t 25)', g: { span: 30, apexHeight: 3.6, thickness: 1.2, depth: 5, postLength: 0, modulus: 2000 } },
]
const RUNS = 40
const RATE_MS = 300

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

function perSecond(fn: (i: number) => number): number {
  let sink = 0, n = 0
  const started = performance.now()
  while (performance.now() - started < RATE_MS) for (let k = 0; k < 1000; k++) sink += fn(n++)
  if (sink === 42.4242) console.log('')
  return n / ((performance.now() - started) / 1000)
}

export interface BistableBenchRow {
  case: string
  'curve ms (median)': number
  'cpu ms (median)': number
  points: number
  'peak err %': number
  'valley err %': number
  'single-mesh valley err %': number
  'closed-form /s': number
  'table /s': number
}

/** Mesh-converged reference: Richardson from 160 and 320 elements (the error falls as h², tests). */
const REFERENCE_ELEMENTS = 320

export function run(): { rows: BistableBenchRow[]; interpolation: Record<string, number>; counts: { rigid: number; posted: number }; load: { start: number[]; end: number[] } } {
  const load = { start: loadavg(), end: [] as number[] }
  const rows: BistableBenchRow[] = []
  for (const { label, g } of CASES) {
    for (let i = 0; i < 5; i++) solveBistableCurve(g)
    const times: number[] = [], cpu: number[] = []
    let curve = solveBistableCurve(g)
    for (let i = 0; i < RUNS; i++) {
      const t0 = performance.now(), c0 = process.cpuUsage()
      curve = solveBistableCurve(g)
      const c1 = process.cpuUsage(c0)
      times.push(performance.now() - t0)
      cpu.push((c1.user + c1.system) / 1000)
    }
    const m = snapMetrics(curve.displacement, curve.force)
    const converged = solveBistableCurve(g, REFERENCE_ELEMENTS)
    const ref = snapMetrics(converged.displacement, converged.force)
    const single = solveBistableFe(g, FE_ELEMENTS)
    const one = snapMetrics(single.displacement, single.force)
    const q = g.apexHeight / g.thickness
    rows.push({
      case: label,
      'curve ms (median)': median(times),
      'cpu ms (median)': median(cpu),
      points: curve.displacement.length,
      'peak err %': (100 * Math.abs(m.peakForce - ref.peakForce)) / Math.abs(ref.peakForce),
      'valley err %': (100 * Math.abs(m.valleyForce - ref.valleyForce)) / Math.abs(ref.valleyForce),
      'single-mesh valley err %': (100 * Math.abs(one.valleyForce - ref.valleyForce)) / Math.abs(ref.valleyForce),
      'closed-form /s': Math.round(perSecond((i) => closedFormMetrics(q + (i % 8) * 1e-3).peak)),
      'table /s': Math.round(perSecond((i) => (estimateBistable({ ...g, span: g.span + (i % 16) * 0.01 }, { modulus: 2000, strainLimit: 0.02 })?.peakForce as number) ?? 0)),
    })
  }
  // interpolation error of the table against direct solves over seeded valid parameters
  const { rows: cases } = caseErrors(bistableTable(), validationCases(5, 240))
  const rigid = cases.filter((r) => r.case.postLength === 0).map((r) => 100 * Math.max(r.errors.peakForce, r.errors.valleyForce))
  const posted = cases.filter((r) => r.case.postLength > 0).map((r) => 100 * Math.max(r.errors.peakForce, r.errors.valleyForce))
  const q = (a: number[], f: number) => [...a].sort((x, y) => x - y)[Math.min(a.length - 1, Math.floor(f * a.length))]
  load.end = loadavg()
  return {
    rows,
    load,
    interpolation: {
      'rigid ends: median %': q(rigid, 0.5), 'rigid ends: p90 %': q(rigid, 0.9), 'rigid ends: max %': Math.max(...rigid),
      'side posts: median %': q(posted, 0.5), 'side posts: p90 %': q(posted, 0.9), 'side posts: max %': Math.max(...posted),
      'reported: peak max %': 100 * bistableTableTolerance().peakForce, 'reported: valley max %': 100 * bistableTableTolerance().valleyForce,
    },
    counts: { rigid: rigid.length, posted: posted.length },
  }
}

export function format(result: ReturnType<typeof run>): string {
  const keys = Object.keys(result.rows[0]) as Array<keyof BistableBenchRow>
  const cell = (v: unknown) => (typeof v === 'number' ? (v >= 1000 ? v.toExponential(2) : Number(v.toPrecision(3)).toString()) : String(v))
  const widths = keys.map((k) => Math.max(k.length, ...result.rows.map((r) => cell(r[k]).length)))
  const line = (vals: string[]) => vals.map((v, i) => (i === 0 ? v.padEnd(widths[i]) : v.padStart(widths[i]))).join('  ')
  const lines = [line(keys as string[]), line(widths.map((w) => '-'.repeat(w))), ...result.rows.map((r) => line(keys.map((k) => cell(r[k]))))]
  const avg = (l: number[]) => l.map((v) => v.toFixed(2)).join(' / ')
  lines.push('', `Curve: Richardson from ${FE_ELEMENTS} and ${FE_ELEMENTS / 2} elements; errors against Richardson from ${REFERENCE_ELEMENTS} and ${REFERENCE_ELEMENTS / 2}; single mesh: ${FE_ELEMENTS} elements.`)
  lines.push(`Load average (1 / 5 / 15 min) at start ${avg(result.load.start)}, at end ${avg(result.load.end)} on ${availableParallelism()} cores shared with others: wall times include waiting, CPU times do not.`)
  lines.push('', `Table interpolation error against direct nonlinear-fe solves (larger of peak and valley error, % of the peak; ${result.counts.rigid} rigid, ${result.counts.posted} with posts; reported = the generator's held-out sample, bistable parts):`)
  for (const [k, v] of Object.entries(result.interpolation)) lines.push(`  ${k.padEnd(22)} ${v.toFixed(2)}`)
  return lines.join('\n')
}

export const title = 'Bistable curved-beam pair: nonlinear curve time, mesh error, closed-form and table throughput'

export default { title, run, format }
