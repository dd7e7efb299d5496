/**
 * Regenerates the precomputed performance tables (npm run tables). Writes
 * catalog/families/bistable-beam/table-data.json (read by table-store.ts); commit the result. A test fails when the
 * solver version in the table differs from the solver's, or when re-solved nodes disagree.
 * Only nodes some valid parameter set needs are solved; the table's interpolation error is
 * then measured on a held-out sample of direct solves and stored with it.
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { SOLVER_VERSION } from '../catalog/solvers'
import { BISTABLE_MODEL_VERSION } from '../catalog/families/bistable-beam/fe-model'
import { defaultAxes, nodeMetrics, nodeNeeded, TABLE_METRICS, type BistableTableFile, type RegionValidation, type TableMetric } from '../catalog/families/bistable-beam/table-build'
import { decodeTable, TABLE_FILE_FORMAT, TABLE_FILE_VERSION } from '../catalog/families/bistable-beam/table-store'
import { validateTable } from '../catalog/families/bistable-beam/table-validation'

const SIGNIFICANT = 6
/** Held-out validation sample: its own seed, not the tests' (tests/catalog/bistable-beam). */
const VALIDATION_SEED = 20240611
const VALIDATION_CASES = 1000
/** Dense validation in each weak region: near the bistability limit, and short side posts. */
const DENSE_CASES = 300

const emptyRegion = (): RegionValidation => ({ cases: 0, uncertain: 0, flips: 0, unmarkedFlips: 0, errors: {} })

function bistableTable(): BistableTableFile {
  const axes = defaultAxes()
  const values = Object.fromEntries(TABLE_METRICS.map((k) => [k, [] as Array<number | null>])) as Record<TableMetric, Array<number | null>>
  const started = Date.now()
  let failed = 0, solved = 0
  for (let iq = 0; iq < axes.q.length; iq++) {
    for (let ie = 0; ie < axes.eta.length; ie++) {
      for (let iw = 0; iw < axes.w.length; iw++) {
        if (!nodeNeeded(axes, iq, ie, iw)) {
          for (const k of TABLE_METRICS) values[k].push(null)
          continue
        }
        const m = nodeMetrics(axes.q[iq], axes.eta[ie], axes.w[iw])
        solved++
        if (!Number.isFinite(m.peak)) failed++
        for (const k of TABLE_METRICS) values[k].push(Number.isFinite(m[k]) ? Number(m[k].toPrecision(SIGNIFICANT)) : null)
      }
    }
    process.stderr.write(`bistable-beam: Q = ${axes.q[iq]} done (${((Date.now() - started) / 1000).toFixed(1)} s, ${solved} nodes solved, ${failed} failed)\n`)
  }
  const table: BistableTableFile = {
    format: TABLE_FILE_FORMAT, formatVersion: TABLE_FILE_VERSION,
    solverVersion: SOLVER_VERSION, modelVersion: BISTABLE_MODEL_VERSION, axes, values,
    validation: {
      seed: 0, cases: 0, bistableCases: 0, uncertainCases: 0, bistable: {}, all: {}, flips: 0, unmarkedFlips: 0, flagBand: 0,
      regions: { nearLimit: emptyRegion(), shortPost: emptyRegion() }, fingerprint: 0, spotChecks: [],
    },
  }
  return table
}

/** Measures and stores the table's validation (npm run tables -- --validate-only re-measures a committed table). */
function validate(table: BistableTableFile): BistableTableFile {
  const t0 = Date.now()
  const validation = validateTable(decodeTable(table), VALIDATION_SEED, VALIDATION_CASES, DENSE_CASES)
  process.stderr.write(`bistable-beam: validated on ${validation.cases} + ${validation.regions.nearLimit.cases} + ${validation.regions.shortPost.cases} direct solves in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`)
  return { ...table, validation }
}

/** Quantiles to four figures: more would only churn the file's diff between runs. */
function serialize(table: BistableTableFile): string {
  const round = (v: number) => Number(v.toPrecision(4))
  const stats = (r: Record<string, { median: number; p90: number; p99: number; max: number }>) =>
    Object.fromEntries(Object.entries(r).map(([k, q]) => [k, { median: round(q.median), p90: round(q.p90), p99: round(q.p99), max: round(q.max) }]))
  const v = table.validation
  const region = (r: RegionValidation) => ({ ...r, errors: stats(r.errors) })
  return JSON.stringify({
    ...table,
    validation: { ...v, flagBand: round(v.flagBand), bistable: stats(v.bistable), all: stats(v.all), regions: { nearLimit: region(v.regions.nearLimit), shortPost: region(v.regions.shortPost) } },
  }) + '\n'
}

const target = fileURLToPath(new URL('../catalog/families/bistable-beam/table-data.json', import.meta.url))
let table: BistableTableFile
if (process.argv.includes('--validate-only')) {
  table = JSON.parse(readFileSync(target, 'utf8')) as BistableTableFile
} else {
  table = bistableTable()
  // the nodes first, so that a failure while validating does not lose them
  writeFileSync(target, serialize(table))
}
table = validate(table)
writeFileSync(target, serialize(table))
process.stderr.write(`wrote ${target}\n${JSON.stringify(table.validation, null, 1)}\n`)
