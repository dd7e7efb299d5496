/**
 * Shared property checks for the module families (fast-check): random valid parameters give
 * finite results through the core's entrance, and a value outside a field's range is refused
 * with a message naming that field.
 */
import fc from 'fast-check'
import { expect } from 'vitest'
import { evaluate, getFamily, ValidationError } from '../../../catalog/index'

/** Valid parameters: draws in range, then kept only when every cross-field rule passes. */
export function validParams(familyId: string, arbitrary: fc.Arbitrary<Record<string, number>>): fc.Arbitrary<Record<string, number>> {
  const family = getFamily(familyId)
  return arbitrary.filter((p) => family.rules.every((r) => r.check(p) === null))
}

/** Evaluates with every method and checks that the curve and every metric are finite (null only where allowed). */
export function expectFiniteResults(familyId: string, params: Record<string, number>, method: string, nullable: string[] = []): void {
  const observed = evaluate(familyId, params, { method })
  expect(observed.curve.displacement.length).toBeGreaterThan(2)
  expect(observed.curve.force.length).toBe(observed.curve.displacement.length)
  for (const v of [...observed.curve.displacement, ...observed.curve.force, ...(observed.curve.strain ?? [])]) expect(Number.isFinite(v)).toBe(true)
  expect(observed.curve.force[0]).toBeCloseTo(0, 9)
  for (const spec of getFamily(familyId).metrics) {
    const value = observed.metrics[spec.key]
    if (value === null && nullable.includes(spec.key)) continue
    expect(typeof value === 'number' && Number.isFinite(value), `${spec.key} = ${value}`).toBe(true)
  }
}

/** An arbitrary (field, out-of-range value) pair over the family's parameters. */
function outOfRange(familyId: string): fc.Arbitrary<{ key: string; value: number }> {
  const specs = getFamily(familyId).params
  return fc.integer({ min: 0, max: specs.length - 1 }).chain((i) => {
    const spec = specs[i]
    const span = spec.max - spec.min
    return fc.oneof(
      fc.double({ min: spec.max + span * 1e-3 + 1e-6, max: spec.max + 10 * span + 1, noNaN: true }),
      fc.double({ min: spec.min - 10 * span - 1, max: spec.min - span * 1e-3 - 1e-6, noNaN: true }),
    ).map((value) => ({ key: spec.key, value }))
  })
}

/** The issues a ValidationError carries for `params` (fails the test when nothing is refused). */
export function issuesOf(familyId: string, params: Record<string, unknown>): Array<{ field: string; message: string }> {
  try {
    evaluate(familyId, params)
  } catch (e) {
    if (e instanceof ValidationError) return e.issues
    throw e
  }
  throw new Error(`expected ${familyId} to refuse ${JSON.stringify(params)}`)
}

/** Property: an out-of-range value in any one field is refused with a message naming that field. */
export function checkRefusesOutOfRange(familyId: string, runs = 60): void {
  fc.assert(
    fc.property(outOfRange(familyId), ({ key, value }) => {
      const issues = issuesOf(familyId, { [key]: value })
      const mine = issues.find((i) => i.field === key)
      expect(mine, `issues ${JSON.stringify(issues)}`).toBeDefined()
      expect(mine!.message).toMatch(/at (least|most)/)
    }),
    { numRuns: runs },
  )
}
