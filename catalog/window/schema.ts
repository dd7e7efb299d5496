/**
 * The engineer's requirement ("force window") as JSON, validated with zod.
 * Shape (issue 6), every part optional but `kind`:
 *   {"kind":"bistable","peakForce":{"min":3,"max":5},"holdingForce":{"min":0.5},"travel":{"max":8},
 *    "footprint":{"length":45,"width":15},"materials":["petg"],"printer":{"nozzle":0.4,"layer":0.2},
 *    "tolerance":{"thickness":0.05,"modulus":0.1},"text":"switch","limit":20}
 * Unknown keys are refused; every message names its field path (`peakForce.min`).
 */
import { z } from 'zod'
import { ValidationError, type FieldIssue } from '../errors'
import { builtinMaterials } from '../materials'
import { FOOTPRINT_BOUNDS, PRINTER_BOUNDS, TOLERANCE_BOUNDS } from './bounds'
import { windowKinds, windowQuantities, type WindowKind } from './quantities'

export { PRINTER_BOUNDS, TOLERANCE_BOUNDS } from './bounds'

export interface WindowRange {
  min?: number
  max?: number
}

export interface PrinterProfile {
  /** Nozzle diameter, mm. */
  nozzle: number
  /** Layer height, mm. */
  layer: number
}

export interface ManufacturingTolerance {
  /** ± wall thickness, mm, applied to every 'wall' parameter together. */
  thickness: number
  /** ± modulus as a fraction (0.1 = ±10 %). */
  modulus: number
}

export interface ForceWindow {
  kind: WindowKind
  peakForce?: WindowRange
  holdingForce?: WindowRange
  travel?: WindowRange
  stiffness?: WindowRange
  rotationalStiffness?: WindowRange
  rotation?: WindowRange
  matingForce?: WindowRange
  separationForce?: WindowRange
  footprint?: { length?: number; width?: number }
  materials?: string[]
  printer?: Partial<PrinterProfile>
  tolerance?: Partial<ManufacturingTolerance>
  text?: string
  limit?: number
}

/** Results returned when the window gives no `limit`. */
export const DEFAULT_LIMIT = 20
const MAX_LIMIT = 200

const finite = (field: string, unit: string) =>
  z.number({ error: `${field} must be a number${unit ? ` in ${unit}` : ''}` })
    .refine(Number.isFinite, { message: `${field} must be a finite number` })

function rangeSchema(key: string, unit: string) {
  const bound = (side: 'min' | 'max') =>
    finite(`${key}.${side}`, unit).refine((v) => v >= 0, { message: `${key}.${side} must not be negative` }).optional()
  return z.strictObject({ min: bound('min'), max: bound('max') }, { error: (iss) => (iss.code === 'unrecognized_keys' ? undefined : `${key} must be an object like {"min": …, "max": …}`) })
    .superRefine((r, ctx) => {
      if (r.min === undefined && r.max === undefined) {
        ctx.addIssue({ code: 'custom', message: `${key} needs a min, a max or both`, path: [] })
      } else if (r.min !== undefined && r.max !== undefined && r.min > r.max) {
        ctx.addIssue({ code: 'custom', message: `${key}.min (${r.min}) must not be above ${key}.max (${r.max})`, path: ['min'] })
      }
    })
    .optional()
}

function within(field: string, unit: string, bounds: { min: number; max: number }, words = '') {
  const u = unit ? ` ${unit}` : ''
  return finite(field, unit).refine((v) => v >= bounds.min && v <= bounds.max, {
    message: `${field} must be from ${bounds.min} to ${bounds.max}${u}${words}`,
  })
}

const footprintSchema = z.strictObject(
  { length: within('footprint.length', 'mm', FOOTPRINT_BOUNDS).optional(), width: within('footprint.width', 'mm', FOOTPRINT_BOUNDS).optional() },
  { error: (iss) => (iss.code === 'unrecognized_keys' ? undefined : 'footprint must be an object like {"length": 45, "width": 15} in mm') },
).optional()

/** A printer profile: nozzle and layer in their bounds, the layer not above the nozzle. */
const printerSchema = z.strictObject(
  { nozzle: within('printer.nozzle', 'mm', PRINTER_BOUNDS.nozzle).optional(), layer: within('printer.layer', 'mm', PRINTER_BOUNDS.layer).optional() },
  { error: (iss) => (iss.code === 'unrecognized_keys' ? undefined : 'printer must be an object like {"nozzle": 0.4, "layer": 0.2} in mm') },
).superRefine((p, ctx) => {
  // A layer taller than the nozzle cannot be laid down (common practice: at most about 0.8 × nozzle).
  if (p.nozzle !== undefined && p.layer !== undefined && p.layer > p.nozzle) {
    ctx.addIssue({ code: 'custom', message: `printer.layer (${p.layer} mm) must not be above printer.nozzle (${p.nozzle} mm)`, path: ['layer'] })
  }
}).optional()

const toleranceSchema = z.strictObject(
  {
    thickness: within('tolerance.thickness', 'mm', TOLERANCE_BOUNDS.thickness).optional(),
    modulus: within('tolerance.modulus', '', TOLERANCE_BOUNDS.modulus, ' (a fraction: 0.1 = ±10 %)').optional(),
  },
  { error: (iss) => (iss.code === 'unrecognized_keys' ? undefined : 'tolerance must be an object like {"thickness": 0.05, "modulus": 0.1}') },
).optional()

function kindSchema(kind: WindowKind, materialIds: readonly string[]) {
  const shape: Record<string, z.ZodType> = { kind: z.literal(kind) }
  for (const q of windowQuantities[kind]) shape[q.key] = rangeSchema(q.key, q.unit)
  shape.footprint = footprintSchema
  shape.materials = z.array(
    z.string({ error: 'materials must hold material ids' }).refine((id) => materialIds.includes(id), {
      error: (iss) => `unknown material "${String(iss.input)}"; known: ${materialIds.join(', ')}`,
    }),
    { error: 'materials must be a list of material ids' },
  ).max(20, { message: 'materials may list at most 20 ids' }).optional()
  shape.printer = printerSchema
  shape.tolerance = toleranceSchema
  shape.text = z.string({ error: 'text must be a string' }).max(200, { message: 'text must be at most 200 characters' }).optional()
  shape.limit = z.number({ error: 'limit must be a number' })
    .refine((v) => Number.isInteger(v) && v >= 1 && v <= MAX_LIMIT, { message: `limit must be a whole number from 1 to ${MAX_LIMIT}` })
    .optional()
  return z.strictObject(shape)
}

function unknownKeyMessage(kind: WindowKind, key: string): string {
  const other = windowKinds.find((k) => k !== kind && windowQuantities[k].some((q) => q.key === key))
  const own = windowQuantities[kind].map((q) => q.key).join(', ')
  return other
    ? `${key} does not apply to a ${kind} window (it belongs to ${other}); a ${kind} window takes ${own}`
    : `unknown window field "${key}"`
}

function toIssues(kind: WindowKind, error: z.ZodError): FieldIssue[] {
  const issues: FieldIssue[] = []
  for (const iss of error.issues) {
    const path = iss.path.map(String)
    if (iss.code === 'unrecognized_keys') {
      for (const key of iss.keys) {
        const field = [...path, key].join('.')
        issues.push({ field, message: path.length ? `unknown field "${field}"` : unknownKeyMessage(kind, key) })
      }
    } else {
      issues.push({ field: path.length ? path.join('.') : 'window', message: iss.message })
    }
  }
  return issues
}

export interface ParseWindowOptions {
  /** Material ids the window may name (the API passes its curated list); built-in ids by default. */
  materialIds?: readonly string[]
}

/** Validates a force window; throws ValidationError with one message per bad field. */
export function parseWindow(raw: unknown, options: ParseWindowOptions = {}): ForceWindow {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new ValidationError([{ field: 'window', message: 'the force window must be a JSON object with a "kind"' }])
  }
  const kind = (raw as Record<string, unknown>).kind
  if (!windowKinds.includes(kind as WindowKind)) {
    const message = kind === undefined ? `kind is required: one of ${windowKinds.join(', ')}` : `kind must be one of ${windowKinds.join(', ')}`
    throw new ValidationError([{ field: 'kind', message }])
  }
  const ids = options.materialIds ?? builtinMaterials.map((m) => m.id)
  const parsed = kindSchema(kind as WindowKind, ids).safeParse(raw)
  if (!parsed.success) throw new ValidationError(toIssues(kind as WindowKind, parsed.error))
  return parsed.data as unknown as ForceWindow
}
