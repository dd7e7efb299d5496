/**
 * Fuzz of every family's closed-form and handbook methods through the core's entrance:
 * 1000 cases per method, three in ten inside the schema (which run the model), the rest
 * out-of-range, wrongly typed, unknown or not an object at all (refused before any model runs).
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate, families, ValidationError } from '../../../catalog/index'
import { checkEvaluateCase, expectRefusedNaming, paramCases, Tally } from './arbitraries'

const RUNS = 1000
const SOLVER_METHODS = new Set(['nonlinear-fe'])

// what a method assumes, so that half of its valid cases stay inside its assumptions
const ASSUME: Record<string, Record<string, number>> = { 'bistable-beam/closed-form': { postLength: 0 } }

const cases = families.flatMap((family) => family.methods.filter((m) => !SOLVER_METHODS.has(m.id)).map((m) => ({ family, method: m.id })))

describe.each(cases.map((c) => [`${c.family.id} (${c.method})`, c] as const))('evaluate %s under fuzzed parameters', (_name, { family, method }) => {
  it(`answers finite numbers or refuses with the field named, over ${RUNS} cases`, () => {
    const tally = new Tally()
    fc.assert(
      fc.property(paramCases(family, { validWeight: 3, assume: ASSUME[`${family.id}/${method}`] }), (c) => {
        tally.add(checkEvaluateCase(family, method, c))
      }),
      { numRuns: RUNS, seed: 8_2024 },
    )
    expect(tally.total()).toBe(RUNS)
    // the mix must really exercise the model, not only the validation
    expect(tally.get('evaluated')).toBeGreaterThan(RUNS * 0.1)
    // a closed form has no path to lose: a SolverError here would mean it produced a non-finite number
    expect(tally.get('solverError')).toBe(0)
  })
})

describe('evaluate with a bad method or material', () => {
  it('names "method" for a method the family does not have, and "material" for an unknown material', () => {
    fc.assert(
      fc.property(fc.constantFrom(...families), fc.string({ maxLength: 20 }), (family, name) => {
        fc.pre(!family.methods.some((m) => m.id === name))
        let error: unknown
        try { evaluate(family.id, {}, { method: name }) } catch (e) { error = e }
        expectRefusedNaming(error, 'method')
        error = undefined
        fc.pre(!['pla', 'petg', 'abs', 'pa12', 'pp'].includes(name))
        try { evaluate(family.id, { material: name }, { method: family.defaultMethod }) } catch (e) { error = e }
        expect(error).toBeInstanceOf(ValidationError)
        expectRefusedNaming(error, 'material')
      }),
      { numRuns: RUNS, seed: 8_2025 },
    )
  })
})
