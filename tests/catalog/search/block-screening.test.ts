import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { families } from '../../../catalog'
import { DEMO_SHELF, estimatorFor, searchShelfSync } from '../../../catalog/search'
import type { FamilyDefinition } from '../../../catalog/schema/types'
import { syntheticShelf, WINDOWS } from '../../../scripts/bench/search'

// Block screening (engine.ts, CandidateJudge.boundBox) bounds a block of the grid from its
// corners. That is sound for a function monotone in each parameter of the box separately: its
// extremes over the box are at corners (common practice: a coordinatewise-monotone function on
// a box takes its maximum at the vertex chosen by each coordinate's direction). So each
// estimator's declaration (monotoneIn) is sampled here, and the search is run with and without
// the blocks.

const declared = families.filter((f) => (estimatorFor(f).monotoneIn ?? []).length > 0)

function validBase(family: FamilyDefinition) {
  return fc.record(Object.fromEntries(family.params.map((p) => [p.key, p.integer
    ? fc.integer({ min: p.min, max: p.max })
    : fc.double({ min: p.min, max: p.max, noNaN: true })]))) as fc.Arbitrary<Record<string, number>>
}

/** -1, 0 or 1: the direction of a sequence, or null when it goes both ways (beyond rounding). */
function direction(values: number[]): number | null {
  let dir = 0
  for (let i = 1; i < values.length; i++) {
    const d = values[i] - values[i - 1]
    if (Math.abs(d) <= 1e-12 * Math.max(Math.abs(values[i]), Math.abs(values[i - 1]))) continue
    const s = Math.sign(d)
    if (dir !== 0 && s !== dir) return null
    dir = s
  }
  return dir
}

describe('block screening', () => {
  it('covers the families whose estimators declare monotone parameters', () => {
    expect(declared.map((f) => f.id).sort()).toEqual(['bistable-beam', 'leaf-hinge', 'notch-hinge', 'parallel-guide', 'serpentine-spring', 'snap-hook'])
  })

  for (const family of declared) {
    const estimator = estimatorFor(family)
    for (const key of estimator.monotoneIn!) {
      it(`${family.id}: every metric is monotone in ${key}, and empty inside only where empty at an end`, () => {
        const spec = family.params.find((p) => p.key === key)!
        fc.assert(fc.property(validBase(family), fc.constantFrom(800, 2000, 3500), fc.constantFrom(0.01, 0.03), (base, E, limit) => {
          const values: number[][] = []
          for (let i = 0; i <= 8; i++) {
            const v = spec.min + ((spec.max - spec.min) * i) / 8
            const params = { ...base, [key]: spec.integer ? Math.round(v) : v }
            if (family.rules.some((r) => r.check(params) !== null)) return true
            const out = new Float64Array(estimator.layout!.keys.length)
            if (!estimator.fill!(params, E, limit, out, { poissonRatio: 0.38, wideBeam: 'auto' })) return true
            values.push([...out])
          }
          for (let slot = 0; slot < estimator.layout!.keys.length; slot++) {
            const column = values.map((v) => v[slot])
            const ends = [column[0], column[column.length - 1]]
            if (ends.every((v) => !Number.isNaN(v)) && column.some((v) => Number.isNaN(v))) throw new Error(`${estimator.layout!.keys[slot]} is empty inside but not at the ends`)
            if (column.some((v) => Number.isNaN(v))) continue
            if (direction(column) === null) throw new Error(`${estimator.layout!.keys[slot]} is not monotone in ${key}: ${column.join(', ')}`)
          }
          return true
        }), { numRuns: 60 })
      })
    }
  }

  it('gives the same answers as the search without blocks', () => {
    // the same families, their estimators without the declaration (no block is formed)
    const plain = families.map((f) => (f.search ? { ...f, search: { ...f.search, estimator: { ...f.search.estimator, monotoneIn: [] } } } : f))
    const shelf = [...DEMO_SHELF, ...syntheticShelf(40)]
    for (const window of Object.values(WINDOWS)) {
      const blocked = searchShelfSync(window, shelf, { confirm: 0 })
      const unblocked = searchShelfSync(window, shelf, { confirm: 0, families: plain })
      expect(blocked.results.length).toBeGreaterThan(0)
      expect({ ...blocked, elapsedMs: 0 }).toEqual({ ...unblocked, elapsedMs: 0 })
    }
  })

  for (const family of declared) {
    const keys = estimatorFor(family).monotoneIn!
    it(`${family.id}: the envelope's area and volume are monotone in ${keys.join(', ')} (a box's smallest envelope is at a corner)`, () => {
      fc.assert(fc.property(validBase(family), fc.constantFrom(...keys), (base, key) => {
        const spec = family.params.find((p) => p.key === key)!
        const areas: number[] = [], volumes: number[] = []
        for (let i = 0; i <= 8; i++) {
          const v = spec.min + ((spec.max - spec.min) * i) / 8
          const env = family.envelope({ ...base, [key]: spec.integer ? Math.round(v) : v })
          areas.push(env.x * env.y)
          volumes.push(env.x * env.y * env.z)
        }
        if (direction(areas) === null) throw new Error(`area not monotone in ${key}: ${areas.join(', ')}`)
        if (direction(volumes) === null) throw new Error(`volume not monotone in ${key}: ${volumes.join(', ')}`)
        return true
      }), { numRuns: 80 })
    })
  }

  // Two hundred entries fill the answer's leads (2 × limit units), so later units are probed
  // (UnitSearch.probe) and most passed over whole; screen: false judges every candidate.
  const twoHundred = [...DEMO_SHELF, ...syntheticShelf(200)]

  it('gives the same answers, reasons and count as judging every candidate (screen: false)', () => {
    for (const window of Object.values(WINDOWS)) {
      const screened = searchShelfSync(window, twoHundred, { confirm: 0 })
      const full = searchShelfSync(window, twoHundred, { confirm: 0, screen: false })
      expect(screened.results.length).toBeGreaterThan(0)
      expect({ ...screened, elapsedMs: 0 }).toEqual({ ...full, elapsedMs: 0 })
    }
  })

  it('estimates about half as often as judging every candidate once the leads are full (the latch window)', () => {
    let fills = 0
    const counting = families.map((f) => (f.id === 'snap-hook' && f.search ? {
      ...f, search: { ...f.search, estimator: { ...f.search.estimator, fill: (...a: Parameters<NonNullable<typeof f.search.estimator.fill>>) => { fills++; return f.search!.estimator.fill!(...a) } } },
    } : f))
    const window = WINDOWS['door latch']
    searchShelfSync(window, twoHundred, { confirm: 0, families: counting })
    const screened = fills
    fills = 0
    searchShelfSync(window, twoHundred, { confirm: 0, families: counting, screen: false })
    expect(screened).toBeGreaterThan(0)
    expect(screened).toBeLessThan(0.6 * fills) // measured: about half
  })

  it('bounds boxes whose corners lock the entry face (an empty mating force is the worst, not the best) as judging every candidate does', () => {
    // entry angles up to 75° with friction up to 0.8 lock the entry face (μ·tan α ≥ 1, the
    // wedge relation of the snap-fit equations); the retaining face locks at 90°
    const base = DEMO_SHELF.find((e) => e.familyId === 'snap-hook')!
    const locking = { ...base, ranges: { ...base.ranges, entryAngle: [40, 75] as [number, number], friction: [0.3, 0.8] as [number, number], retainAngle: [60, 90] as [number, number] } }
    const shelf = syntheticShelf(60, [locking])
    const window = { kind: 'latch', matingForce: { max: 20 }, separationForce: { min: 10 }, limit: 20 }
    const screened = searchShelfSync(window, shelf, { confirm: 0 })
    const full = searchShelfSync(window, shelf, { confirm: 0, screen: false })
    expect(screened.results.length).toBeGreaterThan(0)
    expect({ ...screened, elapsedMs: 0 }).toEqual({ ...full, elapsedMs: 0 })
  })
})
