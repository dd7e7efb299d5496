import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { serializeStl } from '../../../catalog/geometry/stl'
import { checkStl } from '../../../catalog/geometry/mesh-check'
import { headFitProblem } from '../../../catalog/families/snap-hook/geometry'
import type { FamilyDefinition } from '../../../catalog/schema/types'
import { validateParams } from '../../../catalog/schema/validate'
import { analyticArea } from './analytic'
import { familyIds, geometryOf, requireFamily, type Params } from './cases'

/** Random parameters inside the family's schema ranges, kept only when its cross-field rules pass. */
function schemaParams(family: FamilyDefinition): fc.Arbitrary<Params> {
  const fields: Record<string, fc.Arbitrary<number>> = {}
  for (const s of family.params) {
    fields[s.key] = s.integer
      ? fc.integer({ min: s.min, max: s.max })
      : fc.double({ min: s.min, max: s.max, noNaN: true, noDefaultInfinity: true })
  }
  return fc.record(fields).filter((p) => {
    try {
      validateParams(family, p)
    } catch {
      return false
    }
    return family.id !== 'snap-hook' || headFitProblem(p) === null
  })
}

// the booleans take up to ~0.2 s for a bistable frame and milliseconds for the rest
const runs: Record<string, number> = { 'bistable-beam': 12 }

describe.each(familyIds)('%s over random valid parameters', (id) => {
  it('builds a closed, consistently oriented solid of the analytic volume and the envelope box', () => {
    const arbitrary = schemaParams(requireFamily(id))
    fc.assert(
      fc.property(arbitrary, (params) => {
        const report = checkStl(serializeStl(geometryOf[id].build(params)))
        const env = geometryOf[id].envelope(params)
        const { area } = analyticArea[id](params)
        expect(report.unpairedEdges).toBe(0)
        expect(report.orientationErrors).toBe(0)
        expect(report.volume).toBeGreaterThan(0)
        // the faceting bounds of families.test.ts stay below 0.1 % at the range corners; 0.5 % here
        expect(Math.abs(report.volume / (area * env.z) - 1)).toBeLessThan(0.005)
        const expected = [env.x, env.y, env.z]
        report.box.size.forEach((observed, k) => expect(Math.abs(observed - expected[k])).toBeLessThan(1e-5 * 3 * Math.max(...expected)))
      }),
      { numRuns: runs[id] ?? 25, seed: 20240601 },
    )
  })
})
