/**
 * The table's interpolation error against direct nonlinear-fe solves, over seeded random
 * parameter sets inside the family's ranges and cross-field rules. The generator measures it on
 * a held-out sample and stores it with the table; the tests check it on a fresh sample.
 */
import { reportedMetrics, snapMetrics } from './curve-metrics'
import { solveBistableCurve } from './fe-model'
import { params, rules } from './params'
import { estimateFromTable } from './table'
import { ERROR_METRICS, valuesFingerprint, type ErrorQuantiles, type RegionValidation, type TableValidation } from './table-build'
import type { BistableTable } from './table-store'
import { tableUncertainty, type UncertaintyReason } from './uncertainty'

export type BistableCase = { span: number; apexHeight: number; thickness: number; depth: number; postLength: number }

const spec = (key: string) => params.find((p) => p.key === key)!

/**
 * `count` valid parameter sets from a seeded stream (Park–Miller): span and thickness uniform
 * over their ranges, apexHeight/thickness uniform over 1.5–15, a quarter with rigid ends and
 * the rest with posts uniform up to the longest allowed; sets breaking a rule are redrawn.
 */
export function validationCases(seed: number, count: number): BistableCase[] {
  let s = seed
  const rnd = () => { s = (s * 16807) % 2147483647; return s / 2147483647 }
  const span = spec('span'), thick = spec('thickness'), post = spec('postLength'), apex = spec('apexHeight')
  const out: BistableCase[] = []
  while (out.length < count) {
    const c: BistableCase = { span: span.min + rnd() * (span.max - span.min), thickness: thick.min + rnd() * (thick.max - thick.min), apexHeight: 0, depth: 5, postLength: 0 }
    c.apexHeight = c.thickness * (1.5 + rnd() * 13.5)
    const posted = rnd() >= 0.25
    const longest = Math.min(post.max, 0.5 * c.span)
    if (posted) c.postLength = rnd() * longest
    const values = c as unknown as Record<string, number>
    if (c.apexHeight < apex.min || c.apexHeight > apex.max) continue
    if (rules.some((r) => r.check(values) !== null)) continue
    out.push(c)
  }
  return out
}

/** The nonlinear-fe metrics of a case, as the family's evaluate reports them (null where the path is lost). */
export function directMetrics(c: BistableCase, modulus: number, strainLimit: number): Record<string, number | boolean | null> | null {
  try {
    const fe = solveBistableCurve({ ...c, modulus })
    return reportedMetrics(snapMetrics(fe.displacement, fe.force), Math.max(...fe.strain), strainLimit)
  } catch {
    return null
  }
}

export interface CaseError {
  case: BistableCase
  bistable: boolean
  flip: boolean
  /** Why the estimate is marked uncertain (empty when it is not). */
  uncertain: UncertaintyReason[]
  /** |valley|/peak of the direct solve. */
  valleyRatio: number
  /** Direct and table valley/peak. */
  valleyDirect: number
  valleyTable: number
  /** Error per metric as a fraction of the metric itself; only where both report it. */
  errors: Record<string, number>
  /** Peak and valley error as fractions of the peak (the force scale of the part). */
  ofPeak: { peakForce: number; valleyForce: number }
}

/** The error of `table` at each case (cases outside the table or where the solve fails are skipped and counted). */
export function caseErrors(table: BistableTable, cases: BistableCase[]): { rows: CaseError[]; outside: number; failed: number } {
  const modulus = 2000, strainLimit = 0.02
  const rows: CaseError[] = []
  let outside = 0, failed = 0
  for (const c of cases) {
    const est = estimateFromTable(table, c, { modulus, strainLimit })
    if (!est) { outside++; continue }
    const direct = directMetrics(c, modulus, strainLimit)
    if (!direct) { failed++; continue }
    const errors: Record<string, number> = {}
    for (const key of ERROR_METRICS) {
      const a = direct[key], b = est[key]
      if (typeof a === 'number' && typeof b === 'number' && a !== 0) errors[key] = Math.abs(b - a) / Math.abs(a)
    }
    const peak = direct.peakForce as number
    rows.push({
      case: c, bistable: direct.bistable as boolean, flip: est.bistable !== direct.bistable, uncertain: tableUncertainty(c, table) ?? [],
      valleyRatio: Math.abs(direct.valleyForce as number) / peak,
      valleyDirect: (direct.valleyForce as number) / peak, valleyTable: (est.valleyForce as number) / peak,
      errors,
      ofPeak: { peakForce: Math.abs((est.peakForce as number) - peak) / peak, valleyForce: Math.abs((est.valleyForce as number) - (direct.valleyForce as number)) / peak },
    })
  }
  return { rows, outside, failed }
}

function quantiles(values: number[]): ErrorQuantiles {
  const s = [...values].sort((a, b) => a - b)
  const at = (f: number) => (s.length ? s[Math.min(s.length - 1, Math.floor(f * s.length))] : NaN)
  return { median: at(0.5), p90: at(0.9), p99: at(0.99), max: s.length ? s[s.length - 1] : NaN }
}

const per = (list: CaseError[], key: string) => quantiles(list.map((r) => r.errors[key]).filter((v) => v !== undefined))

/**
 * Valid cases from `seed` whose table estimate lies in a region: drawn from the uniform stream
 * and kept when `keep` says so (so a region is sampled densely without solving the rest).
 */
export function regionCases(table: BistableTable, seed: number, count: number, keep: (c: BistableCase, reasons: UncertaintyReason[]) => boolean): BistableCase[] {
  const out: BistableCase[] = []
  // bounded: at most 400 draws per kept case
  for (let round = 0; out.length < count && round < 40; round++) {
    for (const c of validationCases(seed + round * 7919, 10 * count)) {
      const reasons = tableUncertainty(c, table)
      if (reasons && keep(c, reasons)) out.push(c)
      if (out.length >= count) break
    }
  }
  return out
}

/** Near the bistability limit: the estimate's |valley| within twice the uncertain band of the peak (marked and unmarked cases alike). */
export const nearLimit = (table: BistableTable) => (c: BistableCase): boolean => {
  const e = estimateFromTable(table, c, { modulus: 1000, strainLimit: 1 })
  return e !== null && Math.abs(e.valleyForce as number) < 0.3 * (e.peakForce as number)
}
/** Short side posts: posts up to a twentieth of the span on arches of apex height 3–8 × the thickness, where the path may fold. */
export const shortPost = (c: BistableCase): boolean => c.postLength > 0 && c.postLength < 0.05 * c.span && c.apexHeight / c.thickness >= 3 && c.apexHeight / c.thickness <= 8

function region(rows: CaseError[]): RegionValidation {
  const bistable = rows.filter((r) => r.bistable)
  return {
    cases: rows.length,
    uncertain: rows.filter((r) => r.uncertain.length > 0).length,
    flips: rows.filter((r) => r.flip).length,
    unmarkedFlips: rows.filter((r) => r.flip && r.uncertain.length === 0).length,
    errors: Object.fromEntries(ERROR_METRICS.map((k) => [k, per(bistable, k)])),
  }
}

/**
 * Validation statistics of `table` (see TableValidation): `count` uniform cases from `seed`,
 * and `dense` cases in each of the two weak regions from their own streams.
 */
export function validateTable(table: BistableTable, seed: number, count: number, dense: number): TableValidation {
  const { rows } = caseErrors(table, validationCases(seed, count))
  const near = caseErrors(table, regionCases(table, seed + 1, dense, nearLimit(table))).rows
  const posts = caseErrors(table, regionCases(table, seed + 2, dense, shortPost)).rows
  const certain = rows.filter((r) => r.bistable && r.uncertain.length === 0)
  const every = [...rows, ...near, ...posts]
  const flips = every.filter((r) => r.flip)
  const ofPeak = (key: 'peakForce' | 'valleyForce') => quantiles(rows.map((r) => r.ofPeak[key]))
  return {
    seed,
    cases: rows.length,
    bistableCases: rows.filter((r) => r.bistable).length,
    uncertainCases: rows.filter((r) => r.uncertain.length > 0).length,
    bistable: Object.fromEntries(ERROR_METRICS.map((k) => [k, per(certain, k)])),
    all: { peakForce: ofPeak('peakForce'), valleyForce: ofPeak('valleyForce') },
    flips: flips.length,
    unmarkedFlips: flips.filter((r) => r.uncertain.length === 0).length,
    flagBand: flips.length ? Math.max(...flips.map((r) => r.valleyRatio)) : 0,
    regions: { nearLimit: region(near), shortPost: region(posts) },
    fingerprint: valuesFingerprint(table.values),
    spotChecks: rows.slice(0, 6).map((r) => ({ case: r.case, direct: Number(r.valleyDirect.toPrecision(6)), table: Number(r.valleyTable.toPrecision(6)) })),
  }
}
