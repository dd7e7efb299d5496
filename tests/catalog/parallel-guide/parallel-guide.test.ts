import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog/index'
import { linearStiffness, parasiticShortening, solveGuide } from '../../../catalog/families/parallel-guide/model'
import { checkRefusesOutOfRange, expectFiniteResults, issuesOf, validParams } from '../leaf-hinge/property-helpers'

const E = 2000
const guide = { length: 30, thickness: 0.8, depth: 8, spacing: 20 }

describe('parallel-guide: linear beam theory', () => {
  it('small-travel stiffness is 2 × 12EI/L³ (Roark 7th ed., fixed-guided beam, two in parallel)', () => {
    const observed = evaluate('parallel-guide', { ...guide, modulus: E }, { method: 'linear' })
    const I = (8 * 0.8 ** 3) / 12
    expect(observed.metrics.stiffness).toBeCloseTo((24 * E * I) / 30 ** 3, 12)
  })

  it('largest travel puts the blade-end strain 3tδ/L² at the limit (Roark: end moment 6EIδ/L²)', () => {
    const observed = evaluate('parallel-guide', { ...guide, modulus: E, strainLimit: 0.01 }, { method: 'linear' })
    expect(observed.metrics.maxTravel).toBeCloseTo((0.01 * 900) / (3 * 0.8), 12)
    expect(observed.metrics.parasiticMotion).toBeCloseTo(parasiticShortening(30, 3.75), 12)
  })

  it('warns when the travel leaves the linear range (about 10 % of the blade length, Awtar et al. 2007)', () => {
    expect(evaluate('parallel-guide', { ...guide }, { method: 'linear' }).warnings.join(' ')).toMatch(/25 % of the blade length/)
    expect(evaluate('parallel-guide', { length: 12, thickness: 1.2, depth: 8, spacing: 20, strainLimit: 0.02 }, { method: 'linear' }).warnings).toEqual([])
  })

  it('refuses a blade thicker than a tenth of its length, naming thickness', () => {
    expect(issuesOf('parallel-guide', { length: 10, thickness: 2 })[0].field).toBe('thickness')
  })
})

describe('parallel-guide: solver against the closed forms', () => {
  it('small-travel stiffness within 0.3 % of 24EI/L³ (Roark); the rest is the axial stretch of the blades letting the stage tilt', () => {
    const observed = evaluate('parallel-guide', { ...guide, modulus: E }, { method: 'nonlinear-fe' })
    const expected = linearStiffness(guide, E)
    expect(Math.abs((observed.metrics.stiffness as number) / expected - 1)).toBeLessThan(3e-3)
  })

  it('parasitic shortening matches (3/5)δ²/L within 0.5 % at δ = 0.05L and 2 % at δ = 0.2L (Awtar, Slocum & Sevincer 2007)', () => {
    const path = solveGuide(guide, E, 6) // to 0.2L
    const at = (k: number) => ({ travel: path.control[k], shortening: -path.tracked[0][k] })
    const small = at(path.control.findIndex((d) => d >= 1.5 - 1e-9))
    const large = at(path.control.length - 1)
    expect(small.travel).toBeCloseTo(1.5, 9)
    expect(large.travel).toBeCloseTo(6, 9)
    expect(Math.abs(small.shortening / parasiticShortening(30, small.travel) - 1)).toBeLessThan(5e-3)
    expect(Math.abs(large.shortening / parasiticShortening(30, large.travel) - 1)).toBeLessThan(2e-2)
  })

  it('mesh: the default 12 elements per blade are within 0.1 % of 48 in force and shortening', () => {
    const coarse = solveGuide(guide, E, 6)
    const fine = solveGuide(guide, E, 6, 48)
    const last = coarse.control.length - 1
    expect(Math.abs(coarse.reaction[last] / fine.reaction[last] - 1)).toBeLessThan(1e-3)
    expect(Math.abs(coarse.tracked[0][last] / fine.tracked[0][last] - 1)).toBeLessThan(1e-3)
  })

  it('through the core: force–travel curve with strain, limit inside the curve, no warning for defaults', () => {
    const observed = evaluate('parallel-guide', {})
    expect(observed.method).toBe('nonlinear-fe')
    expect(observed.curve.axes.displacement.unit).toBe('mm')
    expect(observed.curve.axes.force.unit).toBe('N')
    expect(observed.curve.displacement.at(-1) as number).toBeGreaterThan(observed.metrics.maxTravel as number)
    expect(observed.metrics.maxStrain).toBeCloseTo(0.02, 6)
    expect(observed.warnings).toEqual([])
  })
})

describe('parallel-guide properties', () => {
  const arbitrary = fc.record({
    length: fc.double({ min: 5, max: 150, noNaN: true }),
    thicknessShare: fc.double({ min: 0.002, max: 0.1, noNaN: true }),
    depth: fc.double({ min: 1, max: 60, noNaN: true }),
    spacing: fc.double({ min: 2, max: 150, noNaN: true }),
  }).map(({ thicknessShare, ...p }) => ({ ...p, thickness: Math.min(5, Math.max(0.3, thicknessShare * p.length)) }))

  it('random valid parameters give finite results (linear)', () => {
    fc.assert(fc.property(validParams('parallel-guide', arbitrary), (p) => expectFiniteResults('parallel-guide', p, 'linear')), { numRuns: 150 })
  })

  it('random valid parameters give finite results (solver)', () => {
    fc.assert(fc.property(validParams('parallel-guide', arbitrary), (p) => expectFiniteResults('parallel-guide', p, 'nonlinear-fe')), { numRuns: 12 })
  })

  it('a value outside any field\u2019s range is refused with a message naming the field', () => {
    checkRefusesOutOfRange('parallel-guide')
  })
})
