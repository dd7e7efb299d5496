/**
 * Search checked from outside: every returned result is re-evaluated here with the family's
 * exact method at every tolerance corner this file enumerates itself (walls ± dt together,
 * clamped to the parameter's range; modulus × (1 ± f)), and judged against the window with
 * plain arithmetic written here; the ranking order is recomputed from bands evaluated here.
 * Nothing the engine reports about its own band or margin is trusted, so a zero tolerance
 * band or a flipped ranking inside the engine fails these tests.
 */
import { describe, expect, it } from 'vitest'
import { evaluate, getFamily } from '../../../catalog'
import { builtinMaterials } from '../../../catalog/materials'
import { DEMO_SHELF, estimatorFor, searchShelfSync, type ShelfEntry } from '../../../catalog/search'

type Params = Record<string, number>
type Range = { min?: number; max?: number }

/** The corners: walls moved together by ±dt (clamped to their ranges), modulus scaled by 1 ± f; nominal first. */
function corners(familyId: string, params: Params, modulus: number, tol: { thickness: number; modulus: number }): Array<{ params: Params; modulus: number }> {
  const family = getFamily(familyId)
  const walls = family.params.filter((p) => p.role === 'wall')
  const out = [{ params, modulus }]
  for (const dt of [-tol.thickness, tol.thickness]) {
    const shifted = { ...params }
    for (const w of walls) shifted[w.key] = Math.min(w.max, Math.max(w.min, params[w.key] + dt))
    for (const f of [-tol.modulus, tol.modulus]) out.push({ params: shifted, modulus: modulus * (1 + f) })
  }
  return out
}

/** Smallest margin of the values of one metric over the corners to a two-sided window range, as a fraction of its width. */
function twoSidedMargin(values: number[], range: Required<Range>): number {
  const lo = Math.min(...values), hi = Math.max(...values)
  return Math.min(lo - range.min, range.max - hi) / (range.max - range.min)
}

const numeric = (p: Record<string, number | string>): Params => Object.fromEntries(Object.entries(p).filter(([, v]) => typeof v === 'number')) as Params

/** A released bistable entry fixed at one geometry (no ranges), in PETG. */
function fixedSwitch(id: string, params: Params): ShelfEntry {
  return { id, familyId: 'bistable-beam', name: `Fixed switch ${id}`, summary: 'A switch fixed at one geometry for the test.', tags: [], materials: ['petg'], defaultParams: { ...params, material: 'petg' }, ranges: {}, status: 'released' }
}

const PETG = { modulus: 2000, strainLimit: 0.02 }

describe('search never keeps a result its exact check contradicts', () => {
  // Clamped ends just above the closed form's limit (apex height 2.31 × the thickness, span 55 ×
  // the thickness): the fast table and the exact solver disagree on the sign of the valley here.
  const near = { span: 55, apexHeight: 2.31, thickness: 1, depth: 6, postLength: 0 }
  const window = { kind: 'bistable', holdingForce: { min: 0.01 }, tolerance: { thickness: 0.001, modulus: 0.01 } }

  it('a near-limit switch whose exact valley is positive is dropped, and the explanation says so', () => {
    const exact = evaluate('bistable-beam', { ...near, material: 'petg' }).metrics
    const answer = searchShelfSync(window, [fixedSwitch('near', near)], { confirm: 1 })
    if (exact.bistable === false) {
      expect(answer.results, 'a part that springs back is not returned').toEqual([])
      expect(answer.dropped.length + (answer.results.length === 0 ? 1 : 0)).toBeGreaterThan(0)
      if (answer.dropped.length) expect(answer.explanation).toMatch(/dropped because the exact method contradicts the fast estimate/)
    }
    for (const r of answer.results) {
      // whatever is kept holds by the exact method at every corner
      for (const c of corners('bistable-beam', numeric(r.params), PETG.modulus, { thickness: 0.001, modulus: 0.01 })) {
        const m = evaluate('bistable-beam', { ...c.params, modulus: c.modulus, strainLimit: PETG.strainLimit }).metrics
        expect(m.bistable).toBe(true)
        expect(-(m.valleyForce as number)).toBeGreaterThanOrEqual(0.01)
      }
    }
  })

  it('marks near-limit estimates uncertain and judges them exactly, whatever their rank (confirm: 0)', () => {
    const answer = searchShelfSync(window, [fixedSwitch('near', near)], { confirm: 0 })
    for (const r of answer.results) expect(r.confirmed?.uncertain?.length, 'an uncertain result carries its exact check').toBeGreaterThan(0)
    for (const d of answer.dropped) expect(d.uncertain.length).toBeGreaterThan(0)
  })
})

describe('every returned bistable result holds by the exact method at every tolerance corner', () => {
  const tol = { thickness: 0.03, modulus: 0.05 }
  const window = { kind: 'bistable', peakForce: { min: 1, max: 6 }, holdingForce: { min: 0.3 }, travel: { max: 6 }, materials: ['petg'], tolerance: tol, limit: 3 }

  it('Power switch, field node shell S1 (demo shelf): peak, holding force, travel and the bistable flag, judged here', () => {
    const shelf = DEMO_SHELF.filter((e) => e.name.startsWith('Power switch'))
    const answer = searchShelfSync(window, shelf, { confirm: 3, budget: 1500 })
    expect(answer.results.length).toBeGreaterThan(0)
    for (const r of answer.results) {
      for (const c of corners('bistable-beam', numeric(r.params), PETG.modulus, tol)) {
        const m = evaluate('bistable-beam', { ...c.params, modulus: c.modulus, strainLimit: PETG.strainLimit }).metrics
        const at = `${JSON.stringify(c.params)} E ${c.modulus}`
        expect(m.bistable, at).toBe(true)
        expect(m.peakForce as number, at).toBeGreaterThanOrEqual(1)
        expect(m.peakForce as number, at).toBeLessThanOrEqual(6)
        expect(-(m.valleyForce as number), at).toBeGreaterThanOrEqual(0.3)
        expect(m.secondStablePosition as number, at).toBeLessThanOrEqual(6)
        expect(m.safetyFactor as number, at).toBeGreaterThanOrEqual(1)
      }
    }
  })
})

describe('spring search: the band and the ranking, recomputed here', () => {
  const tol = { thickness: 0.05, modulus: 0.1 }
  const stiffness = { min: 0.2, max: 0.6 }
  const answer = searchShelfSync({ kind: 'spring', stiffness, tolerance: tol, limit: 8 }, DEMO_SHELF, { confirm: 0, refine: false, budget: 800 })

  /** The stiffness over the corners by the family's fast method (its own closed form), evaluated here. */
  function band(r: (typeof answer.results)[number]): number[] {
    const family = getFamily(r.family)
    const estimator = estimatorFor(family)
    return corners(r.family, numeric(r.params), materialModulus(r.params.material as string), tol)
      .map((c) => {
        const material = builtinMaterials.find((m) => m.id === r.params.material)!
        // search bends with the default wide-beam rule ('auto') and the material's Poisson's ratio
        return estimator.estimate(c.params, c.modulus, material.strainLimit, { poissonRatio: material.poissonRatio, wideBeam: 'auto' }).stiffness as number
      })
  }

  it('every result keeps the whole band inside the window (a zero band in the engine fails here)', () => {
    expect(answer.results.length).toBeGreaterThan(2)
    for (const r of answer.results) expect(twoSidedMargin(band(r), stiffness), JSON.stringify(r.params)).toBeGreaterThanOrEqual(0)
  })

  it('results come in order of their band margin, in 5 % steps of the window (a flipped ranking fails here)', () => {
    const steps = answer.results.map((r) => Math.floor(twoSidedMargin(band(r), stiffness) / 0.05))
    for (let i = 1; i < steps.length; i++) expect(steps[i], `result ${i + 1} after ${i}`).toBeLessThanOrEqual(steps[i - 1])
  })

  it('the first result is as good as any of a longer list (an engine that keeps the worst fails here)', () => {
    const longer = searchShelfSync({ kind: 'spring', stiffness, tolerance: tol, limit: 40 }, DEMO_SHELF, { confirm: 0, refine: false, budget: 800 })
    const step = (r: (typeof answer.results)[number]) => Math.floor(twoSidedMargin(band(r), stiffness) / 0.05)
    const best = Math.max(...longer.results.map(step))
    expect(longer.results.length).toBeGreaterThan(answer.results.length)
    expect(step(answer.results[0])).toBe(best)
  })
})

/** Young's modulus of a built-in material, MPa (its data sheet value, catalog/materials/builtin.ts). */
function materialModulus(id: string): number {
  return builtinMaterials.find((m) => m.id === id)!.modulus
}

describe('search keeps the entry\'s wide-beam rule', () => {
  // A wide switch (depth 6 mm over a 0.7 mm beam, 8.6 × deeper than thick): with the plate-action
  // correction on, bending stiffness is E/(1−ν²) (Timoshenko & Woinowsky-Krieger, Theory of Plates
  // and Shells, cylindrical bending), about 17 % above plain beam theory for PETG (ν 0.38).
  const wide = { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 }
  const plainPeak = evaluate('bistable-beam', { ...wide, material: 'petg', wideBeam: 'off' }).metrics.peakForce as number
  // a window the plain-beam peak sits in and the plate-stiffened one (× 1/(1 − 0.38²) ≈ 1.17) misses
  const window = { kind: 'bistable', peakForce: { min: 0.92 * plainPeak, max: 1.06 * plainPeak }, tolerance: { thickness: 0.001, modulus: 0.005 } }
  const entry = (wideBeam: 'auto' | 'off'): ShelfEntry => ({ ...fixedSwitch(`wide-${wideBeam}`, wide), defaultParams: { ...wide, material: 'petg', wideBeam } })

  it('an entry whose defaults turn the correction off is estimated and confirmed by plain beam theory', () => {
    const answer = searchShelfSync(window, [entry('off')], { confirm: 1 })
    expect(answer.results).toHaveLength(1)
    const confirmed = answer.results[0].confirmed!.metrics!.peakForce as number
    expect(Math.abs(confirmed / plainPeak - 1)).toBeLessThan(1e-6)
  })

  it('the same geometry under the default rule is stiffer by the plate factor and misses the window', () => {
    expect(1 / (1 - 0.38 ** 2), "the factor alone takes the peak out of the window").toBeGreaterThan(1.06 / 0.92)
    expect(searchShelfSync(window, [entry('auto')], { confirm: 1 }).results).toEqual([])
  })
})
