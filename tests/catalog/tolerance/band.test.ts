import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import type { FamilyDefinition, ModelInput } from '../../../catalog/schema/types'
import { curveBand, DEFAULT_TOLERANCE, toleranceBand, valuesAt } from '../../../catalog/tolerance'

// A made-up parallel guide evaluated with the small-deflection closed form: two fixed-guided
// blades in parallel, k = 2 · 12EI/L³ = 24EI/L³, I = b t³/12 (Roark's Formulas for Stress and
// Strain, 7th ed., fixed-guided beam). The curve runs to a fixed 2 mm, on a grid that depends
// on the thickness, so corner curves do not share the nominal grid.
const stiffnessOf = (p: Record<string, number>, E: number) => (24 * E * (p.depth * p.thickness ** 3 / 12)) / p.length ** 3
const guide: FamilyDefinition = {
  id: 'test-guide', name: 'Test guide', kind: 'guide', summary: '',
  params: [
    { key: 'length', label: 'Blade length', unit: 'mm', default: 30, min: 5, max: 150, step: 0.5, help: '', role: 'length' },
    { key: 'thickness', label: 'Blade thickness', unit: 'mm', default: 0.8, min: 0.3, max: 5, step: 0.05, help: '', role: 'wall' },
    { key: 'depth', label: 'Depth', unit: 'mm', default: 8, min: 1, max: 60, step: 0.5, help: '', role: 'length' },
  ],
  rules: [],
  methods: [{ id: 'linear', label: 'Fixed-guided pair', source: 'Roark 7th ed.' }], defaultMethod: 'linear',
  metrics: [], axes: { displacement: { label: 'Travel', unit: 'mm' }, force: { label: 'Force', unit: 'N' } },
  evaluate: ({ params, material }: ModelInput) => {
    const k = stiffnessOf(params, material.modulus)
    const n = 5 + Math.round(params.thickness * 10)
    const displacement = Array.from({ length: n }, (_, i) => (2 * i) / (n - 1))
    // Outer-fibre strain of a fixed-guided blade, ε = 3tδ/L² (same source).
    const maxStrain = (3 * params.thickness * 2) / params.length ** 2
    return {
      curve: { displacement, force: displacement.map((d) => k * d), axes: { displacement: { label: 'Travel', unit: 'mm' }, force: { label: 'Force', unit: 'N' } } },
      metrics: { stiffness: k, maxStrain, safetyFactor: material.strainLimit / maxStrain, parasiticMotion: null, flag: true },
      warnings: [],
    }
  },
  build: () => null, envelope: (p) => ({ x: p.length, y: 20, z: p.depth }), cautions: [],
}

const nominal = { length: 30, thickness: 0.8, depth: 8, modulus: 2000 }

describe('toleranceBand (closed form, force ∝ E t³)', () => {
  it('bounds the stiffness by 24EI/L³ at t ± dt and E ± dE exactly', () => {
    const observed = toleranceBand(guide, nominal, { tolerance: { thickness: 0.05, modulus: 0.1 } })
    const expectedLow = stiffnessOf({ ...nominal, thickness: 0.75 }, 1800)
    const expectedHigh = stiffnessOf({ ...nominal, thickness: 0.85 }, 2200)
    expect(observed.metrics.stiffness![0]).toBeCloseTo(expectedLow, 12)
    expect(observed.metrics.stiffness![1]).toBeCloseTo(expectedHigh, 12)
    expect(observed.nominal.metrics.stiffness).toBeCloseTo(stiffnessOf(nominal, 2000), 12)
    expect(observed.corners).toHaveLength(4)
    expect(observed.complete).toBe(true)
  })

  it('envelopes the corner curves on the nominal grid', () => {
    const observed = toleranceBand(guide, nominal, { tolerance: { thickness: 0.05, modulus: 0.1 } })
    const kLow = stiffnessOf({ ...nominal, thickness: 0.75 }, 1800)
    const kHigh = stiffnessOf({ ...nominal, thickness: 0.85 }, 2200)
    expect(observed.curve.displacement).toEqual(observed.nominal.curve.displacement)
    observed.curve.displacement.forEach((d, i) => {
      expect(observed.curve.low[i]).toBeCloseTo(kLow * d, 12)
      expect(observed.curve.high[i]).toBeCloseTo(kHigh * d, 12)
    })
  })

  it('leaves null metrics null and flags out of the numeric band', () => {
    const observed = toleranceBand(guide, nominal)
    expect(observed.metrics.parasiticMotion).toBeNull()
    expect('flag' in observed.metrics).toBe(false)
    expect(observed.tolerance).toEqual(DEFAULT_TOLERANCE)
  })

  it('clamps a corner below the model range and says so', () => {
    const observed = toleranceBand(guide, { ...nominal, thickness: 0.32 }, { tolerance: { thickness: 0.05, modulus: 0 } })
    expect(observed.warnings).toHaveLength(1)
    expect(observed.warnings[0]).toMatch(/thickness 0\.27 mm .* clamped to 0\.3 mm/)
    expect(observed.metrics.stiffness![0]).toBeCloseTo(stiffnessOf({ ...nominal, thickness: 0.3 }, 2000), 12)
    expect(observed.corners).toHaveLength(2)
  })

  it('evaluates only the nominal point at zero tolerance', () => {
    const observed = toleranceBand(guide, nominal, { tolerance: { thickness: 0, modulus: 0 } })
    expect(observed.corners).toHaveLength(0)
    expect(observed.metrics.stiffness).toEqual([observed.nominal.metrics.stiffness, observed.nominal.metrics.stiffness])
  })

  it('a tighter tolerance never widens the band', () => {
    fc.assert(fc.property(
      fc.double({ min: 0.5, max: 3, noNaN: true }), fc.double({ min: 0, max: 0.2, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }),
      (t, dt, dE, shrink) => {
        const params = { ...nominal, thickness: t }
        const wide = toleranceBand(guide, params, { tolerance: { thickness: dt, modulus: dE } })
        const tight = toleranceBand(guide, params, { tolerance: { thickness: dt * shrink, modulus: dE * shrink } })
        const [wl, wh] = wide.metrics.stiffness!
        const [tl, th] = tight.metrics.stiffness!
        return tl >= wl - 1e-12 * wh && th <= wh + 1e-12 * wh
      },
    ), { numRuns: 60 })
  })
})

describe('curveBand', () => {
  it('counts every crossing of a curve that folds back', () => {
    // Polyline through (0,0) (2,2) (1,3) (3,5): x = 1.5 is crossed at 1.5, 2.5 and 3.5.
    expect(valuesAt([0, 2, 1, 3], [0, 2, 3, 5], 1.5)).toEqual([1.5, 2.5, 3.5])
    const observed = curveBand({ displacement: [0, 1.5, 3], force: [0, 1, 2], axes: guide.axes }, [{ displacement: [0, 2, 1, 3], force: [0, 2, 3, 5], axes: guide.axes }])
    expect(observed.low).toEqual([0, 1, 2])
    expect(observed.high).toEqual([0, 3.5, 5])
  })

  it('leaves a displacement a corner curve does not reach to the others', () => {
    const observed = curveBand({ displacement: [0, 1, 2], force: [0, 1, 2], axes: guide.axes }, [{ displacement: [0, 1], force: [0, 3], axes: guide.axes }])
    expect(observed.high).toEqual([0, 3, 2])
  })
})
