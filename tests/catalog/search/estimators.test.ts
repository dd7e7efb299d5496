/** PETG's Poisson's ratio (docs/references.md §8) under the default wide-beam rule. */
const PETG_BENDING = { poissonRatio: 0.38, wideBeam: 'auto' } as const
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate, families } from '../../../catalog'
import { dedicatedEstimators, estimatorFor } from '../../../catalog/search'
import type { FamilyDefinition } from '../../../catalog/schema/types'

// Each dedicated estimator must reproduce its family's own method (the published formula the
// family implements and tests against its source); here it is held to that family's evaluate.
function validParams(family: FamilyDefinition) {
  return fc.record(Object.fromEntries(family.params.map((p) => [p.key, p.integer
    ? fc.integer({ min: p.min, max: p.max })
    : fc.double({ min: p.min, max: p.max, noNaN: true })]))).filter((params) => family.rules.every((r) => r.check(params as Record<string, number>) === null))
}

const closeTo = (observed: unknown, expected: unknown) => {
  if (typeof expected === 'number' && typeof observed === 'number') return Math.abs(observed - expected) <= 1e-9 * Math.max(1, Math.abs(expected))
  return observed === expected
}

describe('fast estimators', () => {
  for (const family of families.filter((f) => dedicatedEstimators[f.id]?.exact)) {
    it(`${family.id}: equals the family's ${dedicatedEstimators[family.id].method} method`, () => {
      const estimator = estimatorFor(family)
      fc.assert(fc.property(validParams(family), fc.constantFrom('petg', 'pla', 'pp'), (params, material) => {
        const expected = evaluate(family.id, { ...params, material }, { method: estimator.method })
        const observed = estimator.estimate(params as Record<string, number>, expected.material.modulus, expected.material.strainLimit, { poissonRatio: expected.material.poissonRatio, wideBeam: 'auto' })
        for (const [key, value] of Object.entries(observed)) {
          if (!closeTo(value, expected.metrics[key])) throw new Error(`${key}: observed ${value}, expected ${expected.metrics[key]}`)
        }
        return true
      }), { numRuns: 150 })
    })
  }

  it('bistable-beam: the table estimate is wired to the nonlinear-fe metrics (demo entry defaults)', () => {
    // The table's interpolation error is the solver's to report (catalog/families/bistable-beam);
    // this checks the wiring: same keys, same units, same scaling, within a few per cent.
    const estimator = estimatorFor(families.find((f) => f.id === 'bistable-beam')!)
    expect(estimator).toMatchObject({ method: 'table', reproduces: 'nonlinear-fe', exact: false })
    const params = { span: 40, apexHeight: 3, thickness: 0.8, depth: 5, postLength: 0 }
    const exact = evaluate('bistable-beam', { ...params, material: 'petg' }, { method: 'nonlinear-fe' }).metrics
    const observed = estimator.estimate(params, 2000, 0.02, PETG_BENDING)
    for (const key of ['peakForce', 'valleyForce', 'secondStablePosition']) {
      expect(Math.abs((observed[key] as number) / (exact[key] as number) - 1)).toBeLessThan(0.05)
    }
    expect(observed.bistable).toBe(exact.bistable)
  })

  it('falls back to the family\u2019s own fast method when no dedicated estimator exists', () => {
    // a copy without its folder's estimator (the search section)
    const family = { ...families[0], id: 'made-up-copy', search: undefined }
    const estimator = estimatorFor(family)
    expect(estimator.method).toBe(family.methods.find((m) => m.id !== 'nonlinear-fe')!.id)
    const params = Object.fromEntries(family.params.map((p) => [p.key, p.default]))
    const expected = family.evaluate({ params, material: { id: null, name: '', modulus: 2000, strainLimit: 0.02, poissonRatio: 0.38 }, method: estimator.method, wideBeam: 'auto' }).metrics
    expect(estimator.estimate(params, 2000, 0.02, PETG_BENDING)).toEqual(expected)
  })
})
