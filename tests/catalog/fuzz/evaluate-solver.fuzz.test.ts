/**
 * Fuzz of the nonlinear beam solver ('nonlinear-fe') of every family that has it, through the
 * core's entrance. Each file stays under about a minute on the 2-core CI machine: a solver run
 * costs 5–15 ms at the defaults and up to a few hundred ms at the range corners, so of the
 * 1000 cases per family only two in ten are inside the schema (about 200, of which the tally
 * below shows how many really reached the solver); the other eight in ten are out-of-range,
 * wrongly typed, unknown or not objects, which are cheap because they are refused before the
 * solver starts — exactly the inputs that must never reach it.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { families } from '../../../catalog/index'
import { checkEvaluateCase, paramCases, Tally } from './arbitraries'

const RUNS = 1000
const VALID_WEIGHT = 2

const solverFamilies = families.filter((f) => f.methods.some((m) => m.id === 'nonlinear-fe'))

describe.each(solverFamilies.map((f) => [f.id, f] as const))('evaluate %s (nonlinear-fe) under fuzzed parameters', (_id, family) => {
  it(`answers finite numbers, a refusal naming the field, or a SolverError, over ${RUNS} cases`, () => {
    const tally = new Tally()
    fc.assert(
      fc.property(paramCases(family, { validWeight: VALID_WEIGHT }), (c) => {
        tally.add(checkEvaluateCase(family, 'nonlinear-fe', c))
      }),
      { numRuns: RUNS, seed: 8_2026 },
    )
    const reachedSolver = tally.get('evaluated') + tally.get('solverError')
    console.log(`${family.id} nonlinear-fe: ${RUNS} cases, ${reachedSolver} reached the solver (${tally.get('solverError')} SolverError), ${tally.get('crossRule')} refused by cross-field rules, ${tally.get('refused')} refused by the schema`)
    expect(tally.total()).toBe(RUNS)
    expect(reachedSolver).toBeGreaterThanOrEqual(80)
  })
})
