/**
 * From a family's parameter schema to the form the engineer edits: fields with units and
 * limits narrowed to what the entry allows, the starting values and local checks that
 * name the field. The server validates again; its messages win.
 */
import type { FieldIssue } from '@/api'
import type { Family, Material, ParamRanges, ParamSpec } from '@/api/types'
import { formatNumber } from './metrics'

export interface ParamField {
  key: string
  label: string
  unit: string
  min: number
  max: number
  step: number
  help: string
  integer: boolean
  /** Decimals the input shows, from the step. */
  precision: number
  /** True when the entry allows less than the family does. */
  narrowed: boolean
}

export type ParamModel = Record<string, number | null>

type WideBeamChoice = 'auto' | 'off'

export interface ParamFormModel {
  values: ParamModel
  material: string | null
  /** For a family that bends beams: the plate-action correction on ('auto') or off; absent otherwise. */
  wideBeam?: WideBeamChoice
}

/** The family's limits intersected with the entry's allowed range (ignored if they do not overlap). */
export function narrowRange(spec: Pick<ParamSpec, 'min' | 'max'>, range?: [number, number]): { min: number; max: number; narrowed: boolean } {
  if (!range) return { min: spec.min, max: spec.max, narrowed: false }
  const min = Math.max(spec.min, range[0])
  const max = Math.min(spec.max, range[1])
  if (!(min <= max)) return { min: spec.min, max: spec.max, narrowed: false }
  return { min, max, narrowed: min > spec.min || max < spec.max }
}

function decimalsOf(step: number): number {
  if (!Number.isFinite(step) || step <= 0) return 3
  const text = String(step)
  const exp = /e-(\d+)$/.exec(text)
  if (exp) return Number(exp[1])
  const dot = text.indexOf('.')
  return dot === -1 ? 0 : text.length - dot - 1
}

export function paramFields(params: readonly ParamSpec[], ranges: ParamRanges = {}): ParamField[] {
  return params.map((spec) => {
    const { min, max, narrowed } = narrowRange(spec, ranges[spec.key])
    return {
      key: spec.key,
      label: spec.label,
      unit: spec.unit,
      min,
      max,
      step: spec.step,
      help: spec.help,
      integer: spec.integer === true,
      precision: spec.integer ? 0 : decimalsOf(spec.step),
      narrowed,
    }
  })
}

/** Starting values: the entry's defaults where given, else the family's own. */
export function initialParamModel(params: readonly ParamSpec[], defaults: Record<string, number | string> = {}, materials: readonly string[] = [], bendsBeams = false): ParamFormModel {
  const values: ParamModel = {}
  for (const spec of params) {
    const given = defaults[spec.key]
    values[spec.key] = typeof given === 'number' && Number.isFinite(given) ? given : spec.default
  }
  const material = typeof defaults.material === 'string' ? defaults.material : materials[0] ?? null
  if (!bendsBeams) return { values, material }
  return { values, material, wideBeam: defaults.wideBeam === 'off' ? 'off' : 'auto' }
}

/** Problems the browser can see before asking the server: empty, out of range, not whole. */
export function localIssues(fields: readonly ParamField[], values: ParamModel): FieldIssue[] {
  const issues: FieldIssue[] = []
  for (const f of fields) {
    const v = values[f.key]
    const unit = f.unit ? ` ${f.unit}` : ''
    const span = `${formatNumber(f.min, 6)}–${formatNumber(f.max, 6)}${unit}`
    if (v === null || v === undefined || !Number.isFinite(v)) issues.push({ field: f.key, message: `${f.label} is needed (${span})` })
    else if (v < f.min) issues.push({ field: f.key, message: `${f.label} must be at least ${formatNumber(f.min, 6)}${unit} (allowed ${span})` })
    else if (v > f.max) issues.push({ field: f.key, message: `${f.label} must be at most ${formatNumber(f.max, 6)}${unit} (allowed ${span})` })
    else if (f.integer && !Number.isInteger(v)) issues.push({ field: f.key, message: `${f.label} must be a whole number` })
  }
  return issues
}

/**
 * Splits issues into those shown under a field of the form and the rest (cross-field rules
 * naming fields not on the form, `params`, `method`). A cross-field rule's message also
 * goes to the general list so it is read beside the fields it ties together.
 */
export function splitIssues(issues: readonly FieldIssue[], fieldKeys: readonly string[], rules: Family['rules'] = []): { byField: Record<string, string>; general: string[] } {
  const byField: Record<string, string> = {}
  const general: string[] = []
  const crossFields = new Set(rules.filter((r) => r.fields.length > 1).map((r) => r.fields[0]))
  for (const issue of issues) {
    if (fieldKeys.includes(issue.field) || issue.field === 'material') {
      byField[issue.field] = byField[issue.field] ? `${byField[issue.field]} ${issue.message}` : issue.message
      if (crossFields.has(issue.field) && !/must be (at least|at most|a number|a whole)/.test(issue.message)) general.push(issue.message)
    } else {
      general.push(issue.message)
    }
  }
  return { byField, general }
}

/** The body for POST /api/families/:id/evaluate. */
export function evaluationParams(form: ParamFormModel): Record<string, number | string> {
  const params: Record<string, number | string> = {}
  for (const [key, value] of Object.entries(form.values)) if (typeof value === 'number') params[key] = value
  if (form.material) params.material = form.material
  if (form.wideBeam) params.wideBeam = form.wideBeam
  return params
}

/** Materials the entry may be printed in (all curated ones when the entry names none). */
export function allowedMaterials(all: readonly Material[], ids: readonly string[]): Material[] {
  if (!ids.length) return [...all]
  return ids.map((id) => all.find((m) => m.id === id)).filter((m): m is Material => !!m)
}
