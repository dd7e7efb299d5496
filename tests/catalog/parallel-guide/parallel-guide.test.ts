import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog/index'
import { linearStiffness, parasiticShortening, solveGuide } from '../../../catalog/families/parallel-guide/model'
import { checkRefusesOutOfRange, expectFiniteResults, issuesOf, validParams } from '../leaf-hinge/property-helpers'

const E = 2000
const guide = { length: 30, thickness: 0.8, depth: 8, spacing: 20 }

/**
 * Independent check of the guide's blades: the planar elastica of a blade clamped at the base
 * and guided at the stage (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., 1961, §1.11:
 * EI·θ'' = −P·cos θ + H·sin θ along the arc), integrated by fourth-order Runge–Kutta and shot
 * on the clamp curvature until the end slope is zero, with the stage couple of each blade's
 * axial force H = ±F·L/(2·spacing) (statics of the rigid stage) acting through the deflection.
 * Nothing of the solver is used.
 */
function guidedBlade(L: number, EI: number, P: number, H: number): { deflection: number; clampCurvature: number; endCurvature: number } {
  const n = 300, h = L / n
  const f = (th: number) => (-P * Math.cos(th) + H * Math.sin(th)) / EI
  const run = (k0: number) => {
    let th = 0, k = k0, y = 0
    for (let i = 0; i < n; i++) {
      const a1 = k, b1 = f(th), c1 = Math.sin(th)
      const a2 = k + 0.5 * h * b1, b2 = f(th + 0.5 * h * a1), c2 = Math.sin(th + 0.5 * h * a1)
      const a3 = k + 0.5 * h * b2, b3 = f(th + 0.5 * h * a2), c3 = Math.sin(th + 0.5 * h * a2)
      const a4 = k + h * b3, b4 = f(th + h * a3), c4 = Math.sin(th + h * a3)
      th += (h * (a1 + 2 * a2 + 2 * a3 + a4)) / 6
      k += (h * (b1 + 2 * b2 + 2 * b3 + b4)) / 6
      y += (h * (c1 + 2 * c2 + 2 * c3 + c4)) / 6
    }
    return { th, k, y }
  }
  let lo = 0, hi = (10 * P * L) / EI
  for (let it = 0; it < 45; it++) { const mid = 0.5 * (lo + hi); if (run(mid).th > 0) hi = mid; else lo = mid }
  const end = run(0.5 * (lo + hi))
  return { deflection: end.y, clampCurvature: 0.5 * (lo + hi), endCurvature: end.k }
}

/** The shear P that gives a blade deflection δ under axial force H (bisection), and its largest strain. */
function bladeStrainAt(L: number, t: number, b: number, modulus: number, delta: number, H: number): { P: number; strain: number } {
  const EI = (modulus * b * t ** 3) / 12, EA = modulus * b * t
  let lo = 0, hi = (100 * EI * delta) / L ** 3
  for (let it = 0; it < 40; it++) { const mid = 0.5 * (lo + hi); if (guidedBlade(L, EI, mid, H).deflection < delta) lo = mid; else hi = mid }
  const P = 0.5 * (lo + hi), e = guidedBlade(L, EI, P, H)
  return { P, strain: (Math.max(Math.abs(e.clampCurvature), Math.abs(e.endCurvature)) * t) / 2 + Math.abs(H) / EA }
}

describe('parallel-guide: nonlinear-fe against an independent elastica with the stage couple', () => {
  // blades L 20, t 0.8, b 6, E 2000 MPa; a narrow spacing (9.2 mm) makes the couple strong
  for (const spacing of [9.2, 20]) {
    it(`spacing ${spacing} mm: force and largest strain along the travel within 1.5 % of the elastica pair`, () => {
      const L = 20, t = 0.8, b = 6
      const path = solveGuide({ length: L, thickness: t, depth: b, spacing }, E, 3.4, 48)
      for (const i of [10, 30, path.control.length - 1]) {
        const delta = path.control[i], F = path.reaction[i]
        const H = (F * L) / (2 * spacing)
        const tension = bladeStrainAt(L, t, b, E, delta, H), compression = bladeStrainAt(L, t, b, E, delta, -H)
        expect(Math.abs(tension.P + compression.P - F) / F, `force at ${delta.toFixed(2)} mm`).toBeLessThan(0.015)
        const expected = Math.max(tension.strain, compression.strain)
        expect(Math.abs(path.maxStrain[i] - expected) / expected, `strain at ${delta.toFixed(2)} mm`).toBeLessThan(0.015)
      }
    })
  }

  it('a single guided blade without axial load reaches 2 % bending strain at 3.29 mm (elastica), where 3tδ/L² puts it at 3.33 mm', () => {
    const L = 20, t = 0.8, b = 6, EI = (E * b * t ** 3) / 12
    let lo = 0, hi = 10
    for (let it = 0; it < 50; it++) { const mid = 0.5 * (lo + hi); if (guidedBlade(L, EI, mid, 0).clampCurvature * t / 2 < 0.02) lo = mid; else hi = mid }
    const at = guidedBlade(L, EI, 0.5 * (lo + hi), 0).deflection
    expect(at).toBeGreaterThan(3.28)
    expect(at).toBeLessThan(3.30)
  })
})

describe('parallel-guide: linear beam theory', () => {
  it('small-travel stiffness is 2 × 12EI/L³ (Roark 7th ed., fixed-guided beam, two in parallel)', () => {
    // wideBeam 'off': Roark's formula is plain beam theory (the plate factor is checked in tests/catalog/mechanics)
    const observed = evaluate('parallel-guide', { ...guide, modulus: E, wideBeam: 'off' }, { method: 'linear' })
    const I = (8 * 0.8 ** 3) / 12
    expect(observed.metrics.stiffness).toBeCloseTo((24 * E * I) / 30 ** 3, 12)
  })

  it('largest travel puts the blade strain at the limit: bending 3tδ/L² (Roark: end moment 6EIδ/L²) plus the stage couple N/(EA), N = F·L/(2·spacing)', () => {
    const observed = evaluate('parallel-guide', { ...guide, modulus: E, strainLimit: 0.01 }, { method: 'linear' })
    // worked by hand: F = 24EIδ/L³ = 2Ebt³δ/L³, N/(EA) = t²δ/(L²·spacing)
    const perMm = (3 * 0.8) / 900 + (0.8 * 0.8) / (900 * 20)
    expect(observed.metrics.maxTravel).toBeCloseTo(0.01 / perMm, 10)
    expect(observed.metrics.parasiticMotion).toBeCloseTo(parasiticShortening(30, 0.01 / perMm), 12)
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
    // wideBeam 'off' on the solver, and linearStiffness at plain E: Roark's plain beam theory
    const observed = evaluate('parallel-guide', { ...guide, modulus: E, wideBeam: 'off' }, { method: 'nonlinear-fe' })
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
