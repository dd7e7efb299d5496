/**
 * Printer profiles, manufacturing tolerance and one-click printability fixes for the configure
 * screen. The rules themselves are the catalog's (catalog/printability, catalog/tolerance);
 * this only holds what the engineer picks and applies a fix to the form.
 */
import type { ParamFix } from '@catalog/printability/check'
import { PRINTER_BOUNDS, TOLERANCE_BOUNDS } from '@catalog/window/bounds'
import type { PrinterSetting, ToleranceSetting } from '@/api/configure'
import type { ParamFormModel } from './paramForm'

export interface PrinterProfileOption {
  id: string
  label: string
  nozzle: number
  layer: number
}

/** Common FDM set-ups, nozzle / layer in mm (common practice). */
export const PRINTER_PROFILES: readonly PrinterProfileOption[] = [
  { id: '0.4/0.2', label: '0.4 mm nozzle, 0.2 mm layers', nozzle: 0.4, layer: 0.2 },
  { id: '0.6/0.3', label: '0.6 mm nozzle, 0.3 mm layers', nozzle: 0.6, layer: 0.3 },
  { id: '0.25/0.1', label: '0.25 mm nozzle, 0.1 mm layers', nozzle: 0.25, layer: 0.1 },
]
export const CUSTOM_PROFILE = 'custom'

/** The profile id for a printer (a listed one, else custom). */
export function profileIdOf(printer: PrinterSetting): string {
  return PRINTER_PROFILES.find((p) => p.nozzle === printer.nozzle && p.layer === printer.layer)?.id ?? CUSTOM_PROFILE
}

/** Problems with a custom printer, by field, in the words of the window schema. */
export function printerIssues(printer: { nozzle: number | null; layer: number | null }): Record<'nozzle' | 'layer', string> {
  const out = { nozzle: '', layer: '' }
  const { nozzle, layer } = printer
  if (nozzle === null || !Number.isFinite(nozzle)) out.nozzle = 'Nozzle is needed (mm)'
  else if (nozzle < PRINTER_BOUNDS.nozzle.min || nozzle > PRINTER_BOUNDS.nozzle.max) out.nozzle = `Nozzle must be from ${PRINTER_BOUNDS.nozzle.min} to ${PRINTER_BOUNDS.nozzle.max} mm`
  if (layer === null || !Number.isFinite(layer)) out.layer = 'Layer height is needed (mm)'
  else if (layer < PRINTER_BOUNDS.layer.min || layer > PRINTER_BOUNDS.layer.max) out.layer = `Layer height must be from ${PRINTER_BOUNDS.layer.min} to ${PRINTER_BOUNDS.layer.max} mm`
  else if (nozzle !== null && nozzle > 0 && layer > nozzle) out.layer = `Layer height must not be above the nozzle (${nozzle} mm)`
  return out
}

/** Problems with the tolerance inputs (thickness mm, modulus %), by field. */
export function toleranceIssues(t: { thickness: number | null; modulusPercent: number | null }): Record<'thickness' | 'modulus', string> {
  const out = { thickness: '', modulus: '' }
  if (t.thickness === null || !Number.isFinite(t.thickness)) out.thickness = 'Thickness tolerance is needed (mm)'
  else if (t.thickness < TOLERANCE_BOUNDS.thickness.min || t.thickness > TOLERANCE_BOUNDS.thickness.max) {
    out.thickness = `Thickness tolerance must be from ${TOLERANCE_BOUNDS.thickness.min} to ${TOLERANCE_BOUNDS.thickness.max} mm`
  }
  if (t.modulusPercent === null || !Number.isFinite(t.modulusPercent)) out.modulus = 'Modulus tolerance is needed (%)'
  else if (t.modulusPercent < TOLERANCE_BOUNDS.modulus.min * 100 || t.modulusPercent > TOLERANCE_BOUNDS.modulus.max * 100) {
    out.modulus = `Modulus tolerance must be from ${TOLERANCE_BOUNDS.modulus.min * 100} to ${TOLERANCE_BOUNDS.modulus.max * 100} %`
  }
  return out
}

/** The tolerance as the server takes it: modulus as a fraction, rounded clear of float noise. */
export function toleranceSetting(t: { thickness: number; modulusPercent: number }): ToleranceSetting {
  return { thickness: t.thickness, modulus: Number((t.modulusPercent / 100).toPrecision(6)) }
}

/**
 * The form with a printability fix applied: the parameter set to the fix's value. A fix for
 * a parameter the form does not have, or whose value has changed since the check (the
 * engineer edited it meanwhile), is not applied: the answer is null.
 */
export function applyFix(form: ParamFormModel, fix: Pick<ParamFix, 'key' | 'from' | 'to'>): ParamFormModel | null {
  if (!(fix.key in form.values)) return null
  const current = form.values[fix.key]
  if (typeof current !== 'number' || Math.abs(current - fix.from) > 1e-9) return null
  return { ...form, values: { ...form.values, [fix.key]: fix.to } }
}
