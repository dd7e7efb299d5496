/**
 * Fuzz of every family's `build` through the core's entrance (`buildGeometry`) and the STL
 * writer: an in-schema case gives a closed, consistently oriented solid with finite vertices
 * and a positive volume; anything else is refused naming its field.
 *
 * 1000 cases per family. The JSCAD booleans cost up to ~0.25 s for a bistable frame (with
 * its side posts and holes) and 10–70 ms for the other families, so 8 cases in 100 are inside the
 * schema for the bistable frame and 15 in 100 for the others (half of them also pass the
 * cross-field rules); the tally printed below says how many reached JSCAD. The rest are the cheap,
 * hostile inputs that must be refused before any geometry is built. Each file stays under
 * about a minute on the 2-core machine.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { buildGeometry, families, serializeStl } from '../../../catalog/index'
import { checkStl } from '../../../catalog/geometry/mesh-check'
import { expectCoreError, expectRefusedNaming, paramCases, Tally, type ParamCase } from './arbitraries'

const RUNS = 1000
/** Of every 10 cases, how many are in the schema, per family (the booleans' cost decides). */
const VALID_WEIGHT: Record<string, number> = { 'bistable-beam': 0.8 }

function checkBuildCase(familyId: string, c: ParamCase): 'built' | 'crossRule' | 'refused' {
  let solid: unknown
  let error: unknown
  try {
    solid = buildGeometry(familyId, c.params)
  } catch (e) {
    error = e
  }
  if (c.tag === 'valid') {
    if (error !== undefined) {
      expectCoreError(error)
      return 'crossRule'
    }
    const report = checkStl(serializeStl(solid))
    expect(report.triangleCount).toBeGreaterThan(0)
    expect(report.unpairedEdges).toBe(0)
    expect(report.orientationErrors).toBe(0)
    expect(Number.isFinite(report.volume) && report.volume > 0).toBe(true)
    for (const v of [...report.box.min, ...report.box.max]) expect(Number.isFinite(v)).toBe(true)
    return 'built'
  }
  if (error === undefined) throw new Error(`${c.tag} case was built: ${JSON.stringify(c.params)}`)
  expectRefusedNaming(error, c.tag === 'notAnObject' ? 'params' : c.field)
  return 'refused'
}

describe.each(families.map((f) => [f.id, f] as const))('buildGeometry %s under fuzzed parameters', (_id, family) => {
  it(`builds a closed solid or refuses naming the field, over ${RUNS} cases`, () => {
    const tally = new Tally()
    fc.assert(
      fc.property(paramCases(family, { validWeight: VALID_WEIGHT[family.id] ?? 1.5 }), (c) => {
        tally.add(checkBuildCase(family.id, c))
      }),
      { numRuns: RUNS, seed: 8_2027 },
    )
    console.log(`${family.id} build: ${RUNS} cases, ${tally.get('built')} built by JSCAD, ${tally.get('crossRule')} refused by cross-field rules, ${tally.get('refused')} refused by the schema`)
    expect(tally.total()).toBe(RUNS)
    expect(tally.get('built')).toBeGreaterThanOrEqual(10)
  })
})
