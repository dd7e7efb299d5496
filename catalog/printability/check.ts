/**
 * Printability of a configured module on a printer profile: walls against the minimum wall
 * and whole perimeters, the print height against whole layers, with one-click fixes that
 * stay inside the parameter's allowed range, plus the usual printing notes. Common practice
 * throughout (docs/references.md §8), not a published standard.
 */
import type { ParamRanges } from '../schema/validate'
import type { FamilyDefinition, ParamSpec } from '../schema/types'
import type { PrinterProfile } from '../window/schema'
import {
  LAYER_TOLERANCE, MAX_LAYER_PER_NOZZLE, PERIMETER_TOLERANCE, nearestPrintableHeight, nearestPrintableWall, perimetersOf, printerRules, type PrinterRules,
} from './profile'

type CheckLevel = 'ok' | 'warn' | 'fail'

export interface ParamFix {
  key: string
  from: number
  to: number
}

export interface PrintCheck {
  /** `wall.thickness`, `height.depth`, `layer`. */
  id: string
  level: CheckLevel
  message: string
  fix?: ParamFix
}

export interface PrintabilityReport {
  printer: PrinterRules
  checks: PrintCheck[]
  notes: string[]
}

/** Parameters that set the print height: the out-of-plane size of every family (bending plane = build plane). */
export const PRINT_HEIGHT_KEYS = ['depth', 'width'] as const

const PRINTING_NOTES: readonly string[] = Object.freeze([
  'Orientation: lay the part flat so the bending plane is the build plane and the flexures are drawn by perimeters; bending across layers peels them apart (common practice).',
  'Infill: print flexures and hooks at 100 % infill (solid); sparse infill makes stiffness and strength unpredictable (common practice).',
  'Fillet flexure roots where the model allows it: a sharp root concentrates strain and is where printed flexures crack first (common practice).',
  'Calibrate the modulus for your printer and material with a measured coupon; printed moduli spread ±20–30 % with process and orientation.',
  'Predicted forces are estimates: confirm them on printed parts before relying on them, and mind creep and fatigue of polymers under sustained or repeated load.',
])

const mm = (v: number) => `${Number(v.toFixed(3))} mm`

function rangeOf(spec: ParamSpec, ranges?: ParamRanges): [number, number] {
  const r = ranges?.[spec.key]
  return r ? [Math.max(spec.min, r[0]), Math.min(spec.max, r[1])] : [spec.min, spec.max]
}

function wallCheck(spec: ParamSpec, value: number, rules: PrinterRules, range: [number, number]): PrintCheck {
  const id = `wall.${spec.key}`
  const perimeters = perimetersOf(rules, value)
  const whole = Math.round(perimeters)
  // found in constant time, not by listing every printable wall (a fine printer lists thousands)
  const target = nearestPrintableWall(rules, range[0], range[1], value)
  const fix = target !== null && target !== value ? { key: spec.key, from: value, to: target } : undefined
  const line = `${mm(rules.lineWidth)} lines`
  if (value < rules.minimumWall - 1e-9) {
    const offer = fix ? `; ${mm(fix.to)} (${Math.round(perimetersOf(rules, fix.to))} perimeters) is the nearest printable value` : `; no printable value lies inside the allowed range ${mm(range[0])}–${mm(range[1])}`
    return { id, level: 'fail', message: `${spec.label} ${mm(value)} is below the minimum wall of ${mm(rules.minimumWall)} (two ${line})${offer}`, fix }
  }
  if (Math.abs(perimeters - whole) > PERIMETER_TOLERANCE) {
    const offer = fix ? `; ${mm(fix.to)} is ${Math.round(perimetersOf(rules, fix.to))} whole perimeters` : ''
    return { id, level: 'warn', message: `${spec.label} ${mm(value)} is ${perimeters.toFixed(2)} perimeters of ${line}; a whole number prints cleaner and closer to size${offer}`, fix }
  }
  return { id, level: 'ok', message: `${spec.label} ${mm(value)} is ${whole} perimeters of ${line}` }
}

function heightCheck(spec: ParamSpec, value: number, rules: PrinterRules, range: [number, number]): PrintCheck {
  const id = `height.${spec.key}`
  const layers = value / rules.layer
  if (Math.abs(layers - Math.round(layers)) <= LAYER_TOLERANCE) {
    return { id, level: 'ok', message: `${spec.label} ${mm(value)} is ${Math.round(layers)} layers of ${mm(rules.layer)}` }
  }
  const target = nearestPrintableHeight(rules, range[0], range[1], value)
  const fix = target !== null ? { key: spec.key, from: value, to: target } : undefined
  const offer = fix ? `; ${mm(fix.to)} is ${Math.round(fix.to / rules.layer)} whole layers` : ''
  return { id, level: 'warn', message: `${spec.label} ${mm(value)} is ${layers.toFixed(2)} layers of ${mm(rules.layer)}; the slicer will round the print height${offer}`, fix }
}

export interface PrintabilityOptions {
  /** The entry's allowed ranges: fixes stay inside them. */
  ranges?: ParamRanges
}

export function checkPrintability(
  family: FamilyDefinition,
  params: Record<string, number>,
  printer: Partial<PrinterProfile> & { lineWidth?: number } = {},
  options: PrintabilityOptions = {},
): PrintabilityReport {
  const rules = printerRules(printer)
  const checks: PrintCheck[] = []
  if (rules.layer > MAX_LAYER_PER_NOZZLE * rules.nozzle + 1e-9) {
    checks.push({ id: 'layer', level: 'warn', message: `layer height ${mm(rules.layer)} is above three quarters of the ${mm(rules.nozzle)} nozzle; layers bond poorly (common practice)` })
  }
  for (const spec of family.params) {
    const value = params[spec.key]
    if (typeof value !== 'number') continue
    if (spec.role === 'wall') checks.push(wallCheck(spec, value, rules, rangeOf(spec, options.ranges)))
    else if ((PRINT_HEIGHT_KEYS as readonly string[]).includes(spec.key)) checks.push(heightCheck(spec, value, rules, rangeOf(spec, options.ranges)))
  }
  return { printer: rules, checks, notes: [...PRINTING_NOTES] }
}
