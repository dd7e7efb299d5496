/**
 * The configure screen's state as plain data: what a link or a saved configuration says,
 * turned into form values, and the form turned back into the configuration the server checks.
 */
import { DEFAULT_TOLERANCE } from '@catalog/tolerance/defaults'
import { DEFAULT_PRINTER } from '@catalog/printability/profile'
import type { WindowKind } from '@catalog/window/quantities'
import type { Configuration, PrinterSetting, SavedConfiguration, ToleranceSetting } from '@/api/configure'
import type { FieldIssue } from '@/api'
import { evaluationParams, type ParamFormModel } from './paramForm'
import { windowFromForm, windowToForm, type WindowForm } from './configureWindow'
import { profileIdOf, toleranceSetting } from './printSettings'

export interface ToleranceForm {
  /** ± mm. */
  thickness: number | null
  /** ± %. */
  modulusPercent: number | null
}

export interface PrinterForm {
  profile: string
  nozzle: number | null
  layer: number | null
}

export interface SettingsForm {
  method: string | undefined
  window: WindowForm
  tolerance: ToleranceForm
  printer: PrinterForm
}

export function defaultTolerance(): ToleranceForm {
  return { thickness: DEFAULT_TOLERANCE.thickness, modulusPercent: Number((DEFAULT_TOLERANCE.modulus * 100).toPrecision(6)) }
}

/** A saved printer may carry only the nozzle (the contract's SavedConfiguration.printer): the rest is the default's. */
export function printerForm(printer: Partial<PrinterSetting> | null | undefined): PrinterForm {
  const p = { ...DEFAULT_PRINTER, ...printer }
  return { profile: profileIdOf(p), nozzle: p.nozzle, layer: p.layer }
}

function toleranceForm(t: ToleranceSetting | null | undefined): ToleranceForm {
  if (!t) return defaultTolerance()
  return { thickness: t.thickness, modulusPercent: Number((t.modulus * 100).toPrecision(6)) }
}

/** The parts of a configuration a link carries: `?params=…&window=…&tolerance=…&printer=…&method=…`. */
export interface LinkedConfiguration {
  params: Record<string, unknown> | null
  window: Record<string, unknown> | null
  tolerance: ToleranceSetting | null
  printer: PrinterSetting | null
  method: string | null
  /** Query fields that could not be read, by name. */
  problems: FieldIssue[]
}

function readJson(query: Record<string, unknown>, key: string, problems: FieldIssue[]): Record<string, unknown> | null {
  const raw = Array.isArray(query[key]) ? query[key][0] : query[key]
  if (typeof raw !== 'string' || raw === '') return null
  try {
    const value = JSON.parse(raw)
    if (value && typeof value === 'object' && !Array.isArray(value)) return value as Record<string, unknown>
    problems.push({ field: key, message: `${key} in the link must be a JSON object` })
  } catch {
    problems.push({ field: key, message: `${key} in the link is not valid JSON and was ignored` })
  }
  return null
}

const num = (v: unknown): number | undefined => (typeof v === 'number' && Number.isFinite(v) ? v : undefined)

export function readLinkedConfiguration(query: Record<string, unknown>): LinkedConfiguration {
  const problems: FieldIssue[] = []
  const params = readJson(query, 'params', problems)
  const window = readJson(query, 'window', problems)
  const t = readJson(query, 'tolerance', problems)
  const p = readJson(query, 'printer', problems)
  const tolerance = t && num(t.thickness) !== undefined && num(t.modulus) !== undefined ? { thickness: t.thickness as number, modulus: t.modulus as number } : null
  const printer = p && num(p.nozzle) !== undefined && num(p.layer) !== undefined ? { nozzle: p.nozzle as number, layer: p.layer as number } : null
  const method = typeof query.method === 'string' && query.method ? query.method : null
  return { params, window, tolerance, printer, method, problems }
}

/** Entry defaults overlaid with what a link or saved configuration gives (unknown keys dropped). */
export function mergeParams(defaults: Record<string, number | string>, given: Record<string, unknown> | null): Record<string, number | string> {
  const out = { ...defaults }
  if (!given) return out
  for (const [key, value] of Object.entries(given)) {
    if (typeof value === 'number' && Number.isFinite(value)) out[key] = value
    else if (key === 'material' && typeof value === 'string') out.material = value
    else if (key === 'wideBeam' && (value === 'auto' || value === 'off')) out.wideBeam = value
  }
  return out
}

export function settingsFrom(kind: WindowKind, source: Pick<SavedConfiguration, 'method' | 'window' | 'tolerance' | 'printer'> | LinkedConfiguration | null, defaultMethod: string): SettingsForm {
  return {
    method: source?.method ?? defaultMethod,
    window: windowToForm(kind, (source?.window ?? null) as never),
    tolerance: toleranceForm(source?.tolerance ?? null),
    printer: printerForm(source?.printer ?? null),
  }
}

/** The configuration the server checks, downloads and saves. */
export function buildConfiguration(kind: WindowKind, form: ParamFormModel, settings: SettingsForm): Configuration {
  const t = settings.tolerance
  const p = settings.printer
  return {
    params: evaluationParams(form),
    method: settings.method,
    window: windowFromForm(kind, settings.window),
    tolerance: t.thickness !== null && t.modulusPercent !== null ? toleranceSetting({ thickness: t.thickness, modulusPercent: t.modulusPercent }) : null,
    printer: p.nozzle !== null && p.layer !== null ? { nozzle: p.nozzle, layer: p.layer } : null,
  }
}

/**
 * The server's issues sorted to where they are shown: parameter fields (and cross-field
 * rules) by key, window bounds by `peakForce.min`, tolerance and printer by their field.
 */
export function sortIssues(issues: readonly FieldIssue[]): { params: FieldIssue[]; window: Record<string, string>; tolerance: Record<string, string>; printer: Record<string, string>; other: string[] } {
  const out = { params: [] as FieldIssue[], window: {} as Record<string, string>, tolerance: {} as Record<string, string>, printer: {} as Record<string, string>, other: [] as string[] }
  const add = (rec: Record<string, string>, key: string, message: string) => { rec[key] = rec[key] ? `${rec[key]} ${message}` : message }
  for (const i of issues) {
    const [head, ...rest] = i.field.split('.')
    if (head === 'window') {
      if (rest.length >= 2) add(out.window, rest.slice(0, 2).join('.'), i.message)
      else out.other.push(i.message)
    } else if (head === 'tolerance' && rest.length) add(out.tolerance, rest[0], i.message)
    else if (head === 'printer' && rest.length) add(out.printer, rest[0], i.message)
    else if (head === 'tolerance' || head === 'printer' || head === 'params') out.other.push(i.message)
    else out.params.push(i)
  }
  return out
}

/** The route query of the data sheet page (and of a link to this configuration). */
export function datasheetQuery(config: Configuration): Record<string, string> {
  const q: Record<string, string> = { params: JSON.stringify(config.params) }
  if (config.window) q.window = JSON.stringify(config.window)
  if (config.tolerance) q.tolerance = JSON.stringify(config.tolerance)
  if (config.printer) q.printer = JSON.stringify(config.printer)
  if (config.method) q.method = config.method
  return q
}

/** A configuration read back from a link (the data sheet page's query). */
export function configurationFromLink(linked: LinkedConfiguration): Configuration {
  const params: Record<string, number | string> = {}
  for (const [k, v] of Object.entries(linked.params ?? {})) if (typeof v === 'number' || typeof v === 'string') params[k] = v
  return {
    params,
    method: linked.method ?? undefined,
    window: (linked.window as Configuration['window']) ?? null,
    tolerance: linked.tolerance,
    printer: linked.printer,
  }
}
