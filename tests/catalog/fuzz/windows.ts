/**
 * Force windows for the window parser and the search fuzz: well-formed windows of every kind,
 * and windows with one planted fault whose field path the refusal must name.
 */
import fc from 'fast-check'
import { builtinMaterials } from '../../../catalog/index'
import { PRINTER_BOUNDS, TOLERANCE_BOUNDS, windowKinds, windowQuantities, type WindowKind } from '../../../catalog/window'
import { notANumber } from './arbitraries'

export type WindowCase = { tag: 'valid'; window: Record<string, unknown> } | { tag: 'fault'; window: unknown; field: string }

const MATERIAL_IDS = builtinMaterials.map((m) => m.id)

// mostly at the scale of these parts (a few N, mm, N/mm), sometimes far off
const bound = fc.oneof(
  { weight: 3, arbitrary: fc.double({ min: 0, max: 20, noNaN: true, noDefaultInfinity: true }) },
  { weight: 1, arbitrary: fc.double({ min: 0, max: 5000, noNaN: true, noDefaultInfinity: true }) },
)

/** { min }, { max } or { min, max } with min ≤ max. */
const range = fc.oneof(
  bound.map((min) => ({ min })),
  bound.map((max) => ({ max })),
  fc.tuple(bound, bound).map(([a, b]) => ({ min: Math.min(a, b), max: Math.max(a, b) })),
)

export function validWindow(kind: WindowKind): fc.Arbitrary<Record<string, unknown>> {
  const fields: Record<string, fc.Arbitrary<unknown>> = { kind: fc.constant(kind) }
  for (const q of windowQuantities[kind]) fields[q.key] = range
  fields.footprint = fc.record({ length: fc.double({ min: 1, max: 2000, noNaN: true }), width: fc.double({ min: 1, max: 2000, noNaN: true }) }, { requiredKeys: [] })
  fields.materials = fc.subarray(MATERIAL_IDS, { minLength: 1 })
  fields.printer = fc.double({ min: PRINTER_BOUNDS.nozzle.min, max: PRINTER_BOUNDS.nozzle.max, noNaN: true }).chain((nozzle) =>
    fc.double({ min: PRINTER_BOUNDS.layer.min, max: Math.min(PRINTER_BOUNDS.layer.max, nozzle), noNaN: true }).map((layer) => ({ nozzle, layer })))
  fields.tolerance = fc.record({
    thickness: fc.double({ min: TOLERANCE_BOUNDS.thickness.min, max: TOLERANCE_BOUNDS.thickness.max, noNaN: true }),
    modulus: fc.double({ min: TOLERANCE_BOUNDS.modulus.min, max: TOLERANCE_BOUNDS.modulus.max, noNaN: true }),
  }, { requiredKeys: [] })
  fields.text = fc.string({ maxLength: 40 })
  fields.limit = fc.integer({ min: 1, max: 200 })
  return fc.record(fields, { requiredKeys: ['kind'] })
}

const anyValidWindow = fc.constantFrom(...windowKinds).chain((kind) => validWindow(kind).map((w) => ({ kind, w })))

/** One fault planted in an otherwise good window, with the field path its refusal must name. */
const faults: Array<fc.Arbitrary<WindowCase>> = [
  fc.oneof(fc.string({ maxLength: 10 }).filter((k) => !windowKinds.includes(k as WindowKind)), fc.integer(), fc.constant(null))
    .chain((kind) => anyValidWindow.map(({ w }) => ({ tag: 'fault' as const, window: { ...w, kind }, field: 'kind' }))),
  anyValidWindow.map(({ w }) => {
    const { kind: _, ...rest } = w
    return { tag: 'fault' as const, window: rest, field: 'kind' }
  }),
  fc.oneof(fc.string(), fc.integer(), fc.array(fc.jsonValue(), { maxLength: 2 }), fc.constant(null))
    .map((window) => ({ tag: 'fault' as const, window, field: Array.isArray(window) || window === null || typeof window !== 'object' ? 'window' : 'kind' })),
  // a bound that is negative, not a number, or above the other bound
  fc.tuple(anyValidWindow, fc.nat(), fc.oneof(fc.double({ max: -1e-9, noNaN: true }), notANumber)).map(([{ kind, w }, i, bad]) => {
    const q = windowQuantities[kind][i % windowQuantities[kind].length].key
    return { tag: 'fault' as const, window: { ...w, [q]: { min: bad } }, field: `${q}.min` }
  }),
  fc.tuple(anyValidWindow, fc.nat(), bound, fc.double({ min: 1e-6, max: 100, noNaN: true })).map(([{ kind, w }, i, max, gap]) => {
    const q = windowQuantities[kind][i % windowQuantities[kind].length].key
    return { tag: 'fault' as const, window: { ...w, [q]: { min: max + gap, max } }, field: `${q}.min` }
  }),
  fc.tuple(anyValidWindow, fc.nat(), fc.oneof(fc.constant({}), fc.double(), fc.string(), fc.constant(null))).map(([{ kind, w }, i, bad]) => {
    const q = windowQuantities[kind][i % windowQuantities[kind].length].key
    return { tag: 'fault' as const, window: { ...w, [q]: bad }, field: q }
  }),
  fc.tuple(anyValidWindow, fc.nat(), fc.string({ minLength: 1, maxLength: 6 }).filter((k) => k !== 'min' && k !== 'max')).map(([{ kind, w }, i, key]) => {
    const q = windowQuantities[kind][i % windowQuantities[kind].length].key
    return { tag: 'fault' as const, window: { ...w, [q]: { min: 1, [key]: 2 } }, field: `${q}.${key}` }
  }),
  // a quantity of another kind, or a key no window has
  anyValidWindow.chain(({ kind, w }) => {
    const foreign = windowKinds.filter((k) => k !== kind).flatMap((k) => windowQuantities[k].map((q) => q.key))
      .filter((key) => !windowQuantities[kind].some((q) => q.key === key))
    return fc.oneof(fc.constantFrom(...foreign), fc.constantFrom('force', 'peak', 'constructor', 'toString', 'Kind'))
      .map((key) => ({ tag: 'fault' as const, window: { ...w, [key]: { min: 1 } }, field: key }))
  }),
  fc.tuple(anyValidWindow, fc.constantFrom('length', 'width'), fc.oneof(fc.double({ max: 0, noNaN: true }), fc.double({ min: 2000.001, noNaN: true }), notANumber))
    .map(([{ w }, side, bad]) => ({ tag: 'fault' as const, window: { ...w, footprint: { [side]: bad } }, field: `footprint.${side}` })),
  fc.tuple(anyValidWindow, fc.double({ min: 0.1, max: 1, noNaN: true }), fc.double({ min: 1.0001, max: 1.4, noNaN: true }))
    .map(([{ w }, nozzle, factor]) => ({ tag: 'fault' as const, window: { ...w, printer: { nozzle, layer: Math.min(1.5, nozzle * factor) } }, field: 'printer.layer' })),
  fc.tuple(anyValidWindow, fc.oneof(fc.double({ min: 0.9, noNaN: true }), fc.double({ max: -1e-9, noNaN: true }), notANumber))
    .map(([{ w }, bad]) => ({ tag: 'fault' as const, window: { ...w, tolerance: { modulus: bad } }, field: 'tolerance.modulus' })),
  fc.tuple(anyValidWindow, fc.string({ minLength: 1, maxLength: 8 }).filter((id) => !MATERIAL_IDS.includes(id)), fc.nat({ max: 3 }))
    .map(([{ w }, unknown, at]) => {
      const materials = [...MATERIAL_IDS.slice(0, at), unknown]
      return { tag: 'fault' as const, window: { ...w, materials }, field: `materials.${materials.length - 1}` }
    }),
  fc.tuple(anyValidWindow, fc.string({ minLength: 201, maxLength: 400 })).map(([{ w }, text]) => ({ tag: 'fault' as const, window: { ...w, text }, field: 'text' })),
  fc.tuple(anyValidWindow, fc.oneof(fc.integer({ max: 0 }), fc.integer({ min: 201 }), fc.double({ min: 1.01, max: 199.99, noNaN: true }).filter((v) => !Number.isInteger(v)), notANumber))
    .map(([{ w }, limit]) => ({ tag: 'fault' as const, window: { ...w, limit }, field: 'limit' })),
]

/** Of every 100 cases, `validPerHundred` well-formed windows; the rest carry one fault each. */
export function windowCases(validPerHundred: number): fc.Arbitrary<WindowCase> {
  const perFault = Math.max(1, Math.round((100 - validPerHundred) / faults.length))
  return fc.oneof(
    { weight: validPerHundred, arbitrary: anyValidWindow.map(({ w }): WindowCase => ({ tag: 'valid', window: w })) },
    ...faults.map((arbitrary) => ({ weight: perFault, arbitrary })),
  )
}
