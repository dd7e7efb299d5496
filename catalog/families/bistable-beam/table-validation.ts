/**
 * The table's interpolation error against direct nonlinear-fe solves, over seeded random
 * parameter sets inside the family's ranges and cross-field rules. The generator measures it on
 * a held-out sample and stores it with the table; the tests check it on a fresh sample.
 */
import { reportedMetrics, snapMetrics } from './curve-metrics'
import { solveBistableCurve } from './fe-model'
import { params, rules } from './params'
import { estimateFromTable } from './table'
import { ERROR_NORMS, type ErrorQuantiles, type TableValidation } from './table-build'
import type { BistableTable } from './table-store'

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
  /** |valley|/peak of the direct solve. */
  valleyRatio: number
  /** Error per metric key as a fraction of its norm (ERROR_NORMS); only where both report the metric. */
  errors: Record<string, number>
}

/** The error of `table` at each case (cases outside the table or where the solve fails are skipped and counted). */
export function caseErrors(table: BistableTable, cases: BistableCase[]): { rows: CaseError[]; outside: number; failed: number } {
  const modulus = 2000, strainLimit = 0.02
  const rows: CaseError[] = []
  let outside = 0, failed = 0
  for (const c of cases) {
    const direct = directMetrics(c, modulus, strainLimit)
    if (!direct) { failed++; continue }
    const est = estimateFromTable(table, c, { modulus, strainLimit })
    if (!est) { outside++; continue }
    const norms: Record<string, number> = { peakForce: Math.abs(direct.peakForce as number), apexHeight: c.apexHeight, energyIn: Math.abs((direct.energyIn as number | null) ?? NaN), maxStrain: direct.maxStrain as number }
    const errors: Record<string, number> = {}
    for (const [key, norm] of Object.entries(ERROR_NORMS)) {
      const a = direct[key], b = est[key]
      if (typeof a === 'number' && typeof b === 'number' && norms[norm] > 0) errors[key] = Math.abs(b - a) / norms[norm]
    }
    rows.push({ case: c, bistable: direct.bistable as boolean, flip: est.bistable !== direct.bistable, valleyRatio: Math.abs(direct.valleyForce as number) / (direct.peakForce as number), errors })
  }
  return { rows, outside, failed }
}

export function quantiles(values: number[]): ErrorQuantiles {
  const s = [...values].sort((a, b) => a - b)
  const at = (f: number) => (s.length ? s[Math.min(s.length - 1, Math.floor(f * s.length))] : NaN)
  return { median: at(0.5), p90: at(0.9), p99: at(0.99), max: s.length ? s[s.length - 1] : NaN }
}

/** Validation statistics of `table` over `count` cases from `seed` (see TableValidation). */
export function validateTable(table: BistableTable, seed: number, count: number): TableValidation {
  const { rows } = caseErrors(table, validationCases(seed, count))
  const bistableRows = rows.filter((r) => r.bistable)
  const per = (list: CaseError[], key: string) => quantiles(list.map((r) => r.errors[key]).filter((v) => v !== undefined))
  const flips = rows.filter((r) => r.flip)
  return {
    seed,
    cases: rows.length,
    bistableCases: bistableRows.length,
    bistable: Object.fromEntries(Object.keys(ERROR_NORMS).map((k) => [k, per(bistableRows, k)])),
    all: { peakForce: per(rows, 'peakForce'), valleyForce: per(rows, 'valleyForce') },
    flips: flips.length,
    flagBand: flips.length ? Math.max(...flips.map((r) => r.valleyRatio)) : 0,
  }
}
