/**
 * What an engineer configures against an entry: parameters, method, force window,
 * manufacturing tolerance and printer profile. It arrives as a JSON body (check, save) or
 * as URL-encoded JSON in the query of a download link; both end in the same checks, and
 * every problem is reported by field in one 400 answer.
 */
import { z } from 'zod'
import { validateParams, ValidationError, type FamilyDefinition, type FieldIssue } from '../../catalog'
import { resolveTolerance } from '../../catalog/tolerance'
import { parseWindow, type ForceWindow, type ManufacturingTolerance, type PrinterProfile } from '../../catalog/window'
import type { ParamRanges, ParamValues } from '../db'
import { validationFailed } from '../errors'
import { bodySchema, zodIssues } from '../validation'
import type { MaterialView } from './materials'

export interface ConfigurationInput {
  /** The entry's default parameters overlaid with the ones given. */
  params: ParamValues
  method: string | null
  window: ForceWindow | null
  /** Null when not given: the check then uses the common-practice default. A side left out is the default's. */
  tolerance: ManufacturingTolerance | null
  /** Null when not given: the check then uses the common-practice 0.4 mm nozzle at 0.2 mm layers. */
  printer: Partial<PrinterProfile> | null
}

/** The fields of a configuration, shared by the check body, download queries and saved configurations. */
export const configurationShape = {
  params: z.record(z.string(), z.unknown(), { error: 'params must be a JSON object of parameter values' }).optional(),
  method: z.string({ error: 'method must be text (a method id of the family)' }).min(1, 'method must not be empty').max(64, 'method must be at most 64 characters').optional(),
  // window, tolerance and printer are checked by the catalog's window schema, so search and
  // configure give the same messages
  window: z.unknown().optional(),
  tolerance: z.unknown().optional(),
  printer: z.unknown().optional(),
}

export const configurationBody = bodySchema(configurationShape)
export type RawConfiguration = z.infer<typeof configurationBody>

const QUERY_JSON_FIELDS = ['params', 'window', 'tolerance', 'printer'] as const
const QUERY_FIELDS = [...QUERY_JSON_FIELDS, 'method'] as const

/**
 * A download link's query: `params`, `window`, `tolerance` and `printer` as URL-encoded
 * JSON, `method` as plain text. Unknown and repeated fields are refused by name.
 */
export function parseConfigurationQuery(query: Record<string, unknown>): RawConfiguration {
  const issues: FieldIssue[] = []
  const raw: Record<string, unknown> = {}
  for (const [key, value] of Object.entries(query)) {
    if (!(QUERY_FIELDS as readonly string[]).includes(key)) {
      issues.push({ field: key, message: `${key} is not an accepted query field; use ${QUERY_FIELDS.join(', ')}` })
      continue
    }
    if (typeof value !== 'string') {
      issues.push({ field: key, message: `${key} must be given once, as text` })
      continue
    }
    if (key === 'method') {
      raw.method = value
      continue
    }
    try {
      raw[key] = JSON.parse(value)
    } catch {
      issues.push({ field: key, message: `${key} must be URL-encoded JSON (could not read "${value.slice(0, 40)}")` })
    }
  }
  if (issues.length) throw validationFailed(issues)
  const parsed = configurationBody.safeParse(raw)
  if (!parsed.success) throw validationFailed(zodIssues(parsed.error))
  return parsed.data
}

/** The catalog's issues, with the field placed inside the configuration (`window.peakForce.min`). */
function catalogIssues(err: unknown, prefix = ''): FieldIssue[] {
  if (!(err instanceof ValidationError)) throw err
  return err.issues.map((i) => ({ field: prefix + i.field, message: i.message }))
}

export interface ResolveOptions {
  family: FamilyDefinition
  /** Values the given parameters are laid over (the entry's defaults). */
  defaults: ParamValues
  /** Material ids the entry is released for; empty allows any curated material. */
  releasedMaterials: string[]
  /** Allowed ranges the parameters must stay inside (the entry's, or a saved revision's). */
  ranges: ParamRanges
  materials: MaterialView[]
}

/**
 * Validates a raw configuration against the entry: parameters inside its allowed ranges
 * and its released materials, a method of the family, a window of the family's kind, a
 * tolerance and printer the window schema accepts. Throws 400 with every issue at once.
 */
export function resolveConfiguration(raw: RawConfiguration, options: ResolveOptions): ConfigurationInput {
  const { family, defaults, releasedMaterials, ranges, materials } = options
  const issues: FieldIssue[] = []
  const params: ParamValues = { ...defaults, ...(raw.params as ParamValues | undefined) }

  try {
    validateParams(family, params, { ranges, materials })
  } catch (err) {
    issues.push(...catalogIssues(err))
  }
  const givenMaterial = raw.params?.material
  const materialKnown = materials.some((m) => m.id === givenMaterial)
  if (typeof givenMaterial === 'string' && materialKnown && releasedMaterials.length && !releasedMaterials.includes(givenMaterial)) {
    issues.push({ field: 'material', message: `material "${givenMaterial}" is not released for this entry; use one of ${releasedMaterials.join(', ')}` })
  }
  if (raw.method !== undefined && !family.methods.some((m) => m.id === raw.method)) {
    issues.push({ field: 'method', message: `unknown method "${raw.method}" for ${family.id}; use one of ${family.methods.map((m) => m.id).join(', ')}` })
  }

  let window: ForceWindow | null = null
  if (raw.window !== undefined && raw.window !== null) {
    const kind = (raw.window as { kind?: unknown } | null)?.kind
    if (typeof raw.window === 'object' && !Array.isArray(raw.window) && kind !== undefined && kind !== family.kind) {
      issues.push({ field: 'window.kind', message: `window.kind must be "${family.kind}" for a ${family.name} (got ${JSON.stringify(kind)})` })
    } else {
      try {
        window = parseWindow(raw.window, { materialIds: materials.map((m) => m.id) })
      } catch (err) {
        issues.push(...catalogIssues(err, 'window.'))
      }
    }
  }

  let tolerance: ManufacturingTolerance | null = null
  let printer: Partial<PrinterProfile> | null = null
  if (raw.tolerance != null || raw.printer != null) {
    try {
      const settings = parseWindow({ kind: family.kind, tolerance: raw.tolerance ?? undefined, printer: raw.printer ?? undefined })
      if (settings.tolerance) tolerance = resolveTolerance(settings.tolerance)
      if (settings.printer) printer = { ...settings.printer }
    } catch (err) {
      issues.push(...catalogIssues(err))
    }
  }
  // a window written for search may carry its own tolerance and printer; the explicit fields win
  if (!tolerance && window?.tolerance) tolerance = resolveTolerance(window.tolerance)
  if (!printer && window?.printer) printer = { ...window.printer }
  if (issues.length) throw validationFailed(issues)
  return { params, method: raw.method ?? null, window, tolerance, printer }
}
