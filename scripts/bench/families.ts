/**
 * Benchmark section: median wall time of one evaluation (validation, model, finiteness checks)
 * for every method of the hinge, guide, spring and latch families at their default parameters.
 * A benchmark, not a test: it reports medians and asserts nothing.
 * Run alone with `npx tsx scripts/bench/families.ts`, or through the bench runner.
 */
import { evaluate, families } from '../../catalog/index'

const FAMILY_IDS = ['leaf-hinge', 'notch-hinge', 'parallel-guide', 'serpentine-spring', 'snap-hook']
/** Stop sampling a method after this many runs or this much time, whichever comes first. */
const MAX_RUNS = 200
const MAX_MS = 1500
const WARM_UP = 3

export interface FamilyBenchRow {
  family: string
  method: string
  runs: number
  /** Median time of one evaluation, ms. */
  medianMs: number
  /** Points on the returned curve. */
  points: number
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2
}

export function run(): FamilyBenchRow[] {
  const rows: FamilyBenchRow[] = []
  for (const family of families.filter((f) => FAMILY_IDS.includes(f.id))) {
    for (const method of family.methods) {
      for (let i = 0; i < WARM_UP; i++) evaluate(family.id, {}, { method: method.id })
      const times: number[] = []
      let points = 0
      const started = performance.now()
      while (times.length < MAX_RUNS && performance.now() - started < MAX_MS) {
        const t0 = performance.now()
        const result = evaluate(family.id, {}, { method: method.id })
        times.push(performance.now() - t0)
        points = result.curve.displacement.length
      }
      rows.push({ family: family.id, method: method.id, runs: times.length, medianMs: median(times), points })
    }
  }
  return rows
}

export function format(rows: FamilyBenchRow[]): string {
  const lines = ['family             method                      runs   median ms   points']
  for (const r of rows) {
    lines.push(`${r.family.padEnd(18)} ${r.method.padEnd(27)} ${String(r.runs).padStart(4)} ${r.medianMs.toFixed(3).padStart(11)} ${String(r.points).padStart(8)}`)
  }
  return lines.join('\n')
}

export const title = 'Module families: median time per evaluation (default parameters)'

export default { title, run, format }

if (process.argv[1] && /bench[\\/]families\.[tj]s$/.test(process.argv[1])) {
  console.log(title)
  console.log(format(run()))
}
