import { z } from 'zod'
import { ValidationError, type FieldIssue } from '../errors'
import { findBuiltinMaterial } from '../materials'
import { DEFAULT_WIDE_BEAM, WIDE_BEAM_MODES, type WideBeamMode } from '../mechanics/wide-beam'
import type { FamilyDefinition, ResolvedMaterial } from './types'

/** Allowed ranges a librarian set on an entry: key → [min, max], inside the family's own. */
export type ParamRanges = Record<string, [number, number]>

export interface ValidateOptions {
  ranges?: ParamRanges
  /** Materials known beyond the built-in ones (the API passes the curated list). */
  materials?: Array<{ id: string; name: string; modulus: number; strainLimit: number; poissonRatio?: number }>
}

export interface ValidatedParams {
  params: Record<string, number>
  material: ResolvedMaterial
  /** The wide-beam mode ('auto' when not given; always 'off' for a family that bends no beams). */
  wideBeam: WideBeamMode
  /** The input as given plus defaults, echoed in results. */
  echo: Record<string, number | string>
}

export const DEFAULT_MATERIAL_ID = 'petg'

/**
 * Poisson's ratio of a material the caller listed without one (a list made before the ratio
 * existed): the built-in material's of the same id, else the default material's.
 */
export function poissonRatioOf(m: { id: string | null; poissonRatio?: number }): number {
  return m.poissonRatio ?? (m.id ? findBuiltinMaterial(m.id)?.poissonRatio : undefined) ?? findBuiltinMaterial(DEFAULT_MATERIAL_ID)!.poissonRatio
}

function formatNumber(v: number): string {
  return Number.isInteger(v) ? String(v) : String(Number(v.toPrecision(6)))
}

function fieldSchema(spec: FamilyDefinition['params'][number], range?: [number, number]) {
  const lo = range ? Math.max(range[0], spec.min) : spec.min
  const hi = range ? Math.min(range[1], spec.max) : spec.max
  const unit = spec.unit ? ` ${spec.unit}` : ''
  const where = range ? 'allowed for this entry' : 'allowed'
  let s = z.number({ error: `${spec.label} must be a number` })
    .refine(Number.isFinite, { message: `${spec.label} must be a finite number` })
    .refine((v) => v >= lo, { message: `${spec.label} must be at least ${formatNumber(lo)}${unit} (${where} ${formatNumber(lo)}–${formatNumber(hi)}${unit})` })
    .refine((v) => v <= hi, { message: `${spec.label} must be at most ${formatNumber(hi)}${unit} (${where} ${formatNumber(lo)}–${formatNumber(hi)}${unit})` })
  if (spec.integer) s = s.refine(Number.isInteger, { message: `${spec.label} must be a whole number` })
  return s.optional()
}

/** Each family's schema without entry ranges, built once: building one costs more than parsing with it (every evaluation and file validates). */
const plainSchemas = new WeakMap<FamilyDefinition, ReturnType<typeof buildParamsSchema>>()

/** The zod schema of a family's parameters (plus material overrides); unknown keys are refused. */
export function paramsSchema(family: FamilyDefinition, ranges?: ParamRanges) {
  if (ranges) return buildParamsSchema(family, ranges)
  let schema = plainSchemas.get(family)
  if (!schema) {
    schema = buildParamsSchema(family)
    plainSchemas.set(family, schema)
  }
  return schema
}

function buildParamsSchema(family: FamilyDefinition, ranges?: ParamRanges) {
  const shape: Record<string, z.ZodType> = {}
  for (const spec of family.params) shape[spec.key] = fieldSchema(spec, ranges?.[spec.key])
  shape.material = z.string({ error: 'material must be a material id' }).min(1).max(64).optional()
  shape.modulus = z.number({ error: 'modulus must be a number in MPa' })
    .refine((v) => Number.isFinite(v) && v >= 1 && v <= 20000, { message: 'modulus must be between 1 and 20000 MPa' })
    .optional()
  shape.strainLimit = z.number({ error: 'strainLimit must be a number (a fraction, 0.02 = 2 %)' })
    .refine((v) => Number.isFinite(v) && v > 0 && v <= 0.5, { message: 'strainLimit must be a fraction above 0 and at most 0.5 (0.02 = 2 %)' })
    .optional()
  shape.poissonRatio = z.number({ error: "poissonRatio must be a number (Poisson's ratio, 0 to 0.49)" })
    .refine((v) => Number.isFinite(v) && v >= 0 && v <= 0.49, { message: "poissonRatio must be between 0 and 0.49" })
    .optional()
  if (family.bendsBeams) {
    shape.wideBeam = z.enum(WIDE_BEAM_MODES, { error: `wideBeam must be one of ${WIDE_BEAM_MODES.map((m) => `"${m}"`).join(', ')}` }).optional()
  }
  return z.strictObject(shape, { error: (iss) => iss.code === 'unrecognized_keys' ? `unknown parameter` : 'parameters must be a JSON object' })
}

function toIssues(error: z.ZodError): FieldIssue[] {
  const issues: FieldIssue[] = []
  for (const iss of error.issues) {
    if (iss.code === 'unrecognized_keys') {
      for (const key of iss.keys) issues.push({ field: key, message: `unknown parameter "${key}"` })
    } else {
      issues.push({ field: iss.path.length ? iss.path.join('.') : 'params', message: iss.message })
    }
  }
  return issues
}

/**
 * Validates raw parameters against a family's schema (and an entry's narrower ranges),
 * fills in defaults, applies the cross-field rules and resolves the material.
 * Throws ValidationError with one message per bad field.
 */
export function validateParams(family: FamilyDefinition, raw: unknown, options: ValidateOptions = {}): ValidatedParams {
  const input = raw ?? {}
  if (typeof input !== 'object' || Array.isArray(input)) {
    throw new ValidationError([{ field: 'params', message: 'parameters must be a JSON object' }])
  }
  const parsed = paramsSchema(family, options.ranges).safeParse(input)
  if (!parsed.success) throw new ValidationError(toIssues(parsed.error))
  const given = parsed.data as Record<string, number | string | undefined>

  const params: Record<string, number> = {}
  for (const spec of family.params) params[spec.key] = (given[spec.key] as number | undefined) ?? spec.default

  const issues: FieldIssue[] = []
  for (const rule of family.rules) {
    const message = rule.check(params)
    if (message) issues.push({ field: rule.fields[0], message })
  }

  const materialId = (given.material as string | undefined) ?? (given.modulus === undefined ? DEFAULT_MATERIAL_ID : undefined)
  let material: ResolvedMaterial | undefined
  if (materialId !== undefined) {
    const known = options.materials?.find((m) => m.id === materialId) ?? findBuiltinMaterial(materialId)
    if (!known) issues.push({ field: 'material', message: `unknown material "${materialId}"` })
    else material = { id: known.id, name: known.name, modulus: known.modulus, strainLimit: known.strainLimit, poissonRatio: poissonRatioOf(known) }
  }
  if (issues.length) throw new ValidationError(issues)

  const fallback = findBuiltinMaterial(DEFAULT_MATERIAL_ID)!
  const base = material ?? { id: null, name: 'Custom material', modulus: 0, strainLimit: fallback.strainLimit, poissonRatio: fallback.poissonRatio }
  const overridden = given.modulus !== undefined || given.strainLimit !== undefined || given.poissonRatio !== undefined
  const resolved: ResolvedMaterial = {
    id: base.id,
    name: overridden && base.id ? `${base.name} (overridden)` : base.name,
    modulus: (given.modulus as number | undefined) ?? base.modulus,
    strainLimit: (given.strainLimit as number | undefined) ?? base.strainLimit,
    poissonRatio: (given.poissonRatio as number | undefined) ?? base.poissonRatio,
  }
  const wideBeam: WideBeamMode = family.bendsBeams ? ((given.wideBeam as WideBeamMode | undefined) ?? DEFAULT_WIDE_BEAM) : 'off'
  const echo: Record<string, number | string> = { ...params }
  if (resolved.id) echo.material = resolved.id
  if (given.modulus !== undefined) echo.modulus = given.modulus as number
  if (given.strainLimit !== undefined) echo.strainLimit = given.strainLimit as number
  if (given.poissonRatio !== undefined) echo.poissonRatio = given.poissonRatio as number
  if (family.bendsBeams) echo.wideBeam = wideBeam
  return { params, material: resolved, wideBeam, echo }
}
