import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { families } from '../../../catalog'
import { DEMO_SHELF, estimatorFor, searchShelfSync } from '../../../catalog/search'
import type { FamilyDefinition, FastEstimator } from '../../../catalog/schema/types'
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

type Fill = NonNullable<FastEstimator['fill']>

/**
 * Boxes of the monotone parameters around the family's defaults (each side from half to one
 * and a half times the default, inside the parameter's range; the other parameters at their
 * defaults), each with one inner point. Returns the first box where a metric (or the
 * envelope's area or volume) at the inner point leaves the span of its values at the box's
 * lowest and highest corners, or the inner point is empty where neither end is: what
 * FastEstimator.extremesAtEnds rules out (the search then bounds a box from those two
 * corners alone). Also how many boxes were valid (every point passing the rules and inside
 * the estimate), so that a test can tell a pass from a vacuous one.
 */
function endsCounterexample(family: FamilyDefinition, keys: readonly string[], fill: Fill, layoutKeys: readonly string[]): { found: string | null; valid: number } {
  const defaults = Object.fromEntries(family.params.map((p) => [p.key, p.default]))
  const box = fc.record(Object.fromEntries(keys.map((key) => {
    const spec = family.params.find((p) => p.key === key)!
    const unit = fc.double({ min: 0, max: 1, noNaN: true })
    return [key, fc.tuple(unit, unit, unit).map(([a, b, t]) => {
      const at = (v: number) => Math.min(spec.max, Math.max(spec.min, spec.integer ? Math.round(v) : v))
      const lo = at(spec.default * (0.5 + 0.5 * a)), hi = at(spec.default * (1 + 0.5 * b))
      return [lo, at(lo + (hi - lo) * t), hi] as const
    })]
  }))) as fc.Arbitrary<Record<string, readonly [number, number, number]>>
  let found: string | null = null
  let valid = 0
  const property = fc.property(box, fc.constantFrom(800, 2000, 3500), fc.constantFrom(0.01, 0.03), (spans, E, limit) => {
    const points = [0, 1, 2].map((i) => ({ ...defaults, ...Object.fromEntries(keys.map((k) => [k, spans[k][i]])) }))
    if (points.some((p) => family.rules.some((r) => r.check(p) !== null))) return true
    const outs = points.map(() => new Float64Array(layoutKeys.length))
    if (!points.every((p, i) => fill(p, E, limit, outs[i], { poissonRatio: 0.38, wideBeam: 'auto' }))) return true
    valid++
    const [low, inner, high] = outs
    const slack = (a: number, b: number) => 1e-9 * Math.max(Math.abs(a), Math.abs(b))
    for (let slot = 0; slot < layoutKeys.length; slot++) {
      if (Number.isNaN(low[slot]) || Number.isNaN(high[slot])) continue
      const lo = Math.min(low[slot], high[slot]), hi = Math.max(low[slot], high[slot])
      if (Number.isNaN(inner[slot]) || inner[slot] < lo - slack(lo, hi) || inner[slot] > hi + slack(lo, hi)) {
        found = `${layoutKeys[slot]} is ${inner[slot]} inside a box whose ends give ${low[slot]} and ${high[slot]} (${JSON.stringify(points)})`
        return false
      }
    }
    const env = points.map((p) => family.envelope(p))
    const measures = { area: (e: { x: number; y: number }) => e.x * e.y, volume: (e: { x: number; y: number; z: number }) => e.x * e.y * e.z }
    for (const [name, of] of Object.entries(measures)) {
      const [a, m, b] = env.map(of)
      if (m < Math.min(a, b) - slack(a, b)) {
        found = `the envelope's ${name} is ${m} inside a box whose ends give ${a} and ${b}`
        return false
      }
    }
    return true
  })
  const result = fc.check(property, { numRuns: 400, endOnFailure: true })
  if (result.failed && !found) throw new Error(`the property failed without a counterexample: ${String(result.errorInstance)}`)
  return { found, valid }
}

describe('block screening', () => {
  it('covers the families whose estimators declare monotone parameters', () => {
    expect(declared.map((f) => f.id).sort()).toEqual(['bistable-beam', 'leaf-hinge', 'notch-hinge', 'parallel-guide', 'serpentine-spring', 'snap-hook'])
  })

  for (const family of declared) {
    const estimator = estimatorFor(family)
    for (const key of estimator.monotoneIn!) {
      it(`${family.id}: every metric is monotone in ${key}, booleans and emptiness included (empty inside only where empty at an end)`, () => {
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
            // empty on one side of a point and not on the other: then empty at both ends is empty throughout (a box bound keeps it)
            if (direction(column.map((v) => (Number.isNaN(v) ? 1 : 0))) === null) throw new Error(`${estimator.layout!.keys[slot]} turns empty and back along ${key}: ${column.join(', ')}`)
            if (column.some((v) => Number.isNaN(v))) continue
            if (direction(column) === null) throw new Error(`${estimator.layout!.keys[slot]} is not monotone in ${key}: ${column.join(', ')}`)
          }
          return true
        }), { numRuns: 60 })
      })
    }
  }

  const atEnds = families.filter((f) => estimatorFor(f).extremesAtEnds)

  it('bounds boxes from their two ends only for the snap hook, whose metrics go one way with all its monotone parameters', () => {
    expect(atEnds.map((f) => f.id)).toEqual(['snap-hook'])
  })

  for (const family of atEnds) {
    const estimator = estimatorFor(family)
    it(`${family.id}: over a box of ${estimator.monotoneIn!.join(', ')} every metric and the envelope lie between their values at the lowest and highest corners`, () => {
      const { found, valid } = endsCounterexample(family, estimator.monotoneIn!, estimator.fill!, estimator.layout!.keys)
      expect(found).toBeNull()
      expect(valid).toBeGreaterThan(100)
    })
  }

  it('finds an inner point outside the ends where a metric rises with one parameter and falls with another', () => {
    // the snap hook's root strain h·y/(2J l²) rises with the undercut y and falls with the arm length l
    const hook = families.find((f) => f.id === 'snap-hook')!
    const estimator = estimatorFor(hook)
    expect(endsCounterexample(hook, ['undercut', 'length'], estimator.fill!, estimator.layout!.keys).found).toMatch(/^(rootStrain|deflectionForce|matingForce|separationForce|safetyFactor) is /)
  })

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
