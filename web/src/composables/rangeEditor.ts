/**
 * The allowed range of each parameter of a proposal: two numbers per parameter, inside the
 * family's own limits, with the default value between them. Only ranges narrower than the
 * family's are sent; an absent range means "the family's own" (docs/api.md, drafts).
 */
import type { ParamRanges, ParamSpec } from '@/api/types'
import type { FieldIssue } from '@/api'
import { formatNumber } from './metrics'
import type { ParamModel } from './paramForm'

export interface RangeValue {
  min: number | null
  max: number | null
}

export type RangeModel = Record<string, RangeValue>

/** The editor's starting values: the given ranges where set, else the family's limits. */
export function initialRangeModel(params: readonly Pick<ParamSpec, 'key' | 'min' | 'max'>[], ranges: ParamRanges = {}): RangeModel {
  const model: RangeModel = {}
  for (const p of params) {
    const r = ranges[p.key]
    model[p.key] = r ? { min: r[0], max: r[1] } : { min: p.min, max: p.max }
  }
  return model
}

const span = (spec: Pick<ParamSpec, 'min' | 'max' | 'unit'>) => `${formatNumber(spec.min, 6)}–${formatNumber(spec.max, 6)}${spec.unit ? ` ${spec.unit}` : ''}`
const withUnit = (v: number, unit: string) => `${formatNumber(v, 6)}${unit ? ` ${unit}` : ''}`

/**
 * Problems of the ranges as the server would name them (`ranges.<key>`), plus a default
 * value outside its range (`defaultParams.<key>`, shown under the default).
 */
export function rangeIssues(params: readonly ParamSpec[], model: RangeModel, defaults: ParamModel = {}): FieldIssue[] {
  const issues: FieldIssue[] = []
  for (const spec of params) {
    const r = model[spec.key]
    const field = `ranges.${spec.key}`
    if (!r || r.min === null || r.max === null || !Number.isFinite(r.min) || !Number.isFinite(r.max)) {
      issues.push({ field, message: `${spec.label}: give both ends of the allowed range (the family allows ${span(spec)})` })
      continue
    }
    if (r.min < spec.min) issues.push({ field, message: `${spec.label}: the lowest allowed value ${withUnit(r.min, spec.unit)} is below the family's limit ${withUnit(spec.min, spec.unit)}` })
    else if (r.max > spec.max) issues.push({ field, message: `${spec.label}: the highest allowed value ${withUnit(r.max, spec.unit)} is above the family's limit ${withUnit(spec.max, spec.unit)}` })
    else if (r.min > r.max) issues.push({ field, message: `${spec.label}: the lowest allowed value ${withUnit(r.min, spec.unit)} is above the highest ${withUnit(r.max, spec.unit)}` })
    else {
      const d = defaults[spec.key]
      if (typeof d === 'number' && (d < r.min || d > r.max)) {
        issues.push({ field: `defaultParams.${spec.key}`, message: `${spec.label}: the default ${withUnit(d, spec.unit)} must lie inside the allowed range ${withUnit(r.min, spec.unit)}–${withUnit(r.max, spec.unit)}` })
      }
    }
  }
  return issues
}

/** The `ranges` body: only the parameters narrowed below the family's limits. */
export function rangesBody(params: readonly Pick<ParamSpec, 'key' | 'min' | 'max'>[], model: RangeModel): ParamRanges {
  const out: ParamRanges = {}
  for (const p of params) {
    const r = model[p.key]
    if (!r || r.min === null || r.max === null) continue
    if (r.min > p.min || r.max < p.max) out[p.key] = [r.min, r.max]
  }
  return out
}

/** Where the allowed range and the default sit on the family's scale, 0–1, for the small bar beside each row. */
export function rangeBar(spec: Pick<ParamSpec, 'min' | 'max'>, r: RangeValue, value: number | null): { from: number; to: number; at: number | null } {
  const width = spec.max - spec.min
  const clamp = (v: number) => Math.min(1, Math.max(0, width > 0 ? (v - spec.min) / width : 0))
  const lo = r.min ?? spec.min
  const hi = r.max ?? spec.max
  return { from: clamp(Math.min(lo, hi)), to: clamp(Math.max(lo, hi)), at: typeof value === 'number' && Number.isFinite(value) ? clamp(value) : null }
}
