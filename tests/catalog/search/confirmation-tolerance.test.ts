import { describe, expect, it } from 'vitest'
import { DEMO_SHELF, searchShelfSync } from '../../../catalog/search'
import { bistableTableTolerance } from '../../../catalog/families/bistable-beam/estimate'

// Issue 6: the exact-solver confirmation of the top results agrees with the fast estimate
// within the tolerance the bistable table reports (its generator's held-out error).
describe('search confirmation against the table\u2019s stated error', () => {
  const answer = searchShelfSync({ kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 }, materials: ['petg'] }, DEMO_SHELF, { confirm: 5 })

  it('states the allowance for every confirmed bistable result', () => {
    const confirmed = answer.results.filter((r) => r.confirmed && r.confirmed.metrics)
    expect(confirmed.length).toBeGreaterThanOrEqual(5)
    for (const r of confirmed) {
      expect(r.confirmed!.tolerance).toBeDefined()
      expect(Object.keys(r.confirmed!.tolerance!)).toEqual(expect.arrayContaining(['peakForce', 'valleyForce']))
    }
  })

  it('finds the top results whose estimate is certain inside that allowance (uncertain ones are judged exactly instead)', () => {
    const certain = answer.results.filter((x) => x.confirmed && x.confirmed.metrics && !x.confirmed.uncertain?.length)
    for (const r of certain) {
      const c = r.confirmed!
      expect(c.withinTolerance).toBe(true)
      const peak = c.metrics!.peakForce as number
      const fast = r.metrics.peakForce as number
      expect(Math.abs(peak - fast)).toBeLessThanOrEqual(bistableTableTolerance().peakForce * Math.abs(peak) + 1e-12)
      expect(r.why).toMatch(/inside the fast table\u2019s measured error/)
    }
    // the uncertain ones were kept only because the exact band itself lies inside the window
    const uncertain = answer.results.filter((x) => x.confirmed?.uncertain?.length)
    for (const r of uncertain) expect(r.confirmed!.margin!).toBeGreaterThanOrEqual(0)
    expect(certain.length + uncertain.length).toBeGreaterThanOrEqual(5)
  })
})
