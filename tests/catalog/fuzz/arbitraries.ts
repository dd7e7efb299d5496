/**
 * Hostile and careless input for the engineering core (fast-check arbitraries), and the
 * checks every fuzz file shares: which outcome a case may have, and that every number in
 * an answer is finite.
 *
 * A case is tagged with what it is, so a test can assert the right outcome for it:
 * - `valid`: every value inside its schema range (cross-field rules may still refuse it);
 * - `outOfRange`, `wrongType`: one named field is bad, and the ValidationError must name it;
 * - `unknownKey`: one key the schema does not know, named in the refusal;
 * - `notAnObject`: the parameters are not an object at all (field `params`).
 */
import fc from 'fast-check'
import { expect } from 'vitest'
import { builtinMaterials, evaluate, SolverError, ValidationError, type FamilyDefinition } from '../../../catalog/index'

type Params = Record<string, unknown>

export type ParamCase =
  | { tag: 'valid'; params: Params }
  | { tag: 'outOfRange' | 'wrongType' | 'unknownKey'; params: Params; field: string }
  | { tag: 'notAnObject'; params: unknown }

const MATERIAL_IDS = builtinMaterials.map((m) => m.id)

/** Values that are not usable numbers: types JSON can carry, plus the non-finite numbers a JS caller can pass. */
export const notANumber: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, null, true, false, '', '12', '1e3', 'NaN', '0x10'),
  fc.string({ maxLength: 12 }),
  fc.array(fc.double(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 4 }), fc.integer(), { maxKeys: 2 }),
)

/** A number strictly outside [min, max]: near the edge, far off, or at the extremes of a double. */
function outside(min: number, max: number): fc.Arbitrary<number> {
  const span = max - min
  return fc.oneof(
    fc.double({ min: max + span * 1e-6 + 1e-9, max: max + 10 * span + 1, noNaN: true }),
    fc.double({ min: min - 10 * span - 1, max: min - span * 1e-6 - 1e-9, noNaN: true }),
    fc.constantFrom(Number.MAX_VALUE, -Number.MAX_VALUE, 1e300, -1e300),
  )
}

/** Keys no family knows; some of them are object-prototype names that naive code trips on. */
function unknownKey(family: FamilyDefinition): fc.Arbitrary<string> {
  const known = new Set([...family.params.map((s) => s.key), 'material', 'modulus', 'strainLimit'])
  return fc.oneof(
    fc.constantFrom('__proto__', 'constructor', 'toString', 'hasOwnProperty', 'valueOf', 'spanMm', 'Span', 'speed'),
    fc.string({ minLength: 1, maxLength: 10 }),
  ).filter((k) => !known.has(k))
}

/** One in-range value per parameter (integers where the schema asks for them); each key present or left to its default. */
function inRangeParams(family: FamilyDefinition, options: { material?: boolean } = {}): fc.Arbitrary<Params> {
  const fields: Record<string, fc.Arbitrary<unknown>> = {}
  for (const s of family.params) {
    const value = s.integer
      ? fc.integer({ min: s.min, max: s.max })
      : fc.oneof(
        { weight: 3, arbitrary: fc.double({ min: s.min, max: s.max, noNaN: true, noDefaultInfinity: true }) },
        // near the default, so families with many cross-field rules still reach their model often
        { weight: 3, arbitrary: fc.double({ min: s.default - 0.25 * (s.default - s.min), max: s.default + 0.25 * (s.max - s.default), noNaN: true, noDefaultInfinity: true }) },
        // the edges themselves, where closed forms divide by small differences
        { weight: 1, arbitrary: fc.constantFrom(s.min, s.max, s.default) },
      )
    fields[s.key] = value
  }
  if (options.material !== false) {
    fields.material = fc.constantFrom(...MATERIAL_IDS)
    fields.modulus = fc.double({ min: 1, max: 20000, noNaN: true })
    fields.strainLimit = fc.double({ min: 1e-4, max: 0.5, noNaN: true })
  }
  return fc.record(fields, { requiredKeys: [] }) as fc.Arbitrary<Params>
}

export interface CaseOptions {
  /** Of every 10 cases, how many are inside the schema (the rest are refused before any model runs). */
  validWeight?: number
  /** Values a method assumes (e.g. no side posts for a closed form), set on half of the valid cases. */
  assume?: Params
}

/**
 * Cases mixed so that `validWeight` of every 10 are in range; half of those are also kept
 * only when every cross-field rule passes, so each family's model runs often however many
 * rules it has. The rest are refused before any model runs.
 */
export function paramCases(family: FamilyDefinition, options: CaseOptions = {}): fc.Arbitrary<ParamCase> {
  const validWeight = options.validWeight ?? 3
  const keys = family.params.map((s) => s.key)
  const base = inRangeParams(family)
  const passesRules = base
    .map((params) => ({ ...params, ...options.assume }))
    .filter((params) => {
      const numbers: Record<string, number> = {}
      for (const s of family.params) numbers[s.key] = typeof params[s.key] === 'number' ? (params[s.key] as number) : s.default
      return family.rules.every((r) => r.check(numbers) === null)
    })
  const oneField = fc.integer({ min: 0, max: keys.length - 1 })
  // fast-check wants whole weights: out of 1000, split over the two valid and four refused kinds
  const valid = Math.max(1, Math.round(validWeight * 50))
  const bad = Math.round((10 - validWeight) * 25)
  return fc.oneof(
    { weight: valid, arbitrary: base.map((params): ParamCase => ({ tag: 'valid', params })) },
    { weight: valid, arbitrary: passesRules.map((params): ParamCase => ({ tag: 'valid', params })) },
    {
      weight: bad,
      arbitrary: fc.tuple(base, oneField).chain(([params, i]) => {
        const spec = family.params[i]
        return outside(spec.min, spec.max).map((v): ParamCase => ({ tag: 'outOfRange', params: { ...params, [spec.key]: v }, field: spec.key }))
      }),
    },
    {
      weight: bad,
      arbitrary: fc.tuple(base, oneField, notANumber).map(([params, i, v]): ParamCase => ({ tag: 'wrongType', params: { ...params, [keys[i]]: v }, field: keys[i] })),
    },
    {
      weight: bad,
      arbitrary: fc.tuple(base, unknownKey(family), fc.jsonValue()).map(([params, key, v]): ParamCase => {
        const withKey = { ...params }
        // defineProperty: a plain assignment to "__proto__" would change the prototype, not add a key (JSON.parse adds a key)
        Object.defineProperty(withKey, key, { value: v, enumerable: true, configurable: true, writable: true })
        return { tag: 'unknownKey', params: withKey, field: key }
      }),
    },
    {
      weight: bad,
      arbitrary: fc.oneof(fc.string(), fc.double(), fc.boolean(), fc.array(fc.jsonValue(), { maxLength: 3 }))
        .map((params): ParamCase => ({ tag: 'notAnObject', params })),
    },
  )
}

/** Every number in an evaluation's curve and metrics is finite (metrics may be booleans or null). */
function expectAllFinite(observed: { curve: { displacement: number[]; force: number[]; strain?: number[] }; metrics: Record<string, unknown> }): void {
  const { displacement, force, strain } = observed.curve
  expect(displacement.length).toBeGreaterThan(1)
  expect(force.length).toBe(displacement.length)
  if (strain) expect(strain.length).toBe(displacement.length)
  for (const series of [displacement, force, strain ?? []]) {
    for (const v of series) if (!Number.isFinite(v)) throw new Error(`non-finite curve value ${v}`)
  }
  for (const [key, v] of Object.entries(observed.metrics)) {
    if (typeof v === 'number' && !Number.isFinite(v)) throw new Error(`metric ${key} is ${v}`)
    if (v !== null && typeof v !== 'number' && typeof v !== 'boolean') throw new Error(`metric ${key} has type ${typeof v}`)
  }
}

/** Deeply: every number anywhere in a JSON-like value is finite (search answers, windows). */
export function expectNoNonFinite(value: unknown, path = 'answer'): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new Error(`${path} is ${value}`)
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => expectNoNonFinite(v, `${path}[${i}]`))
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) expectNoNonFinite(v, `${path}.${k}`)
  }
}

/** The refusal of a case that names a bad field: a ValidationError with an issue for that field and a message. */
export function expectRefusedNaming(error: unknown, field: string): void {
  if (!(error instanceof ValidationError)) throw new Error(`expected a ValidationError naming "${field}", got ${describeError(error)}`)
  const issue = error.issues.find((i) => i.field === field)
  expect(issue, `issues ${JSON.stringify(error.issues)} should name ${field}`).toBeDefined()
  expect(issue!.message.length).toBeGreaterThan(5)
}

/** Only the core's two errors may escape, each with a message (a TypeError or RangeError is a crash). */
export function expectCoreError(error: unknown): asserts error is ValidationError | SolverError {
  if (error instanceof ValidationError) {
    expect(error.issues.length).toBeGreaterThan(0)
    for (const i of error.issues) {
      expect(typeof i.field).toBe('string')
      expect(i.message.length).toBeGreaterThan(0)
    }
    return
  }
  if (error instanceof SolverError) {
    expect(error.message.length).toBeGreaterThan(0)
    return
  }
  throw new Error(`crash: ${describeError(error)}`)
}

export function describeError(error: unknown): string {
  return error instanceof Error ? `${error.name}: ${error.message}\n${error.stack}` : String(error)
}

/** Tally of outcomes, printed so the file says how many cases reached the model or solver. */
export class Tally {
  readonly counts: Record<string, number> = {}
  add(what: string): void {
    this.counts[what] = (this.counts[what] ?? 0) + 1
  }
  get(what: string): number {
    return this.counts[what] ?? 0
  }
  total(): number {
    return Object.values(this.counts).reduce((a, b) => a + b, 0)
  }
}

/**
 * Runs one case through `evaluate` and checks its outcome: a valid case gives finite numbers,
 * a cross-field refusal naming one of the family's parameters, or a SolverError; every other
 * case is refused naming its bad field. Returns what happened, for the tally.
 */
export function checkEvaluateCase(family: FamilyDefinition, method: string, c: ParamCase): 'evaluated' | 'crossRule' | 'solverError' | 'refused' {
  let observed: ReturnType<typeof evaluate> | undefined
  let error: unknown
  try {
    observed = evaluate(family.id, c.params, { method })
  } catch (e) {
    error = e
  }
  if (c.tag === 'valid') {
    if (observed) {
      expectAllFinite(observed)
      return 'evaluated'
    }
    expectCoreError(error)
    if (error instanceof SolverError) return 'solverError'
    // a cross-field rule names one of its parameters; a model may also refuse a method outside its assumptions
    const keys = [...family.params.map((s) => s.key), 'method']
    for (const issue of error.issues) expect(keys, `cross-field issue ${JSON.stringify(issue)}`).toContain(issue.field)
    return 'crossRule'
  }
  if (observed) throw new Error(`${c.tag} case was accepted: ${JSON.stringify(c.params)}`)
  expectRefusedNaming(error, c.tag === 'notAnObject' ? 'params' : c.field)
  return 'refused'
}
