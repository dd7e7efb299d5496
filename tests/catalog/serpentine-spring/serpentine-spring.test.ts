import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog/index'
import { castiglianoStiffness, meanderMoments, solveMeander } from '../../../catalog/families/serpentine-spring/model'
import { checkRefusesOutOfRange, expectFiniteResults, issuesOf, validParams } from '../leaf-hinge/property-helpers'

describe('serpentine-spring: Castigliano meander formula', () => {
  it('N = 5, a = 2, b = 20, EI = 1 gives k = 2.41936e-4 (REFERENCES §6 check value)', () => {
    expect(castiglianoStiffness(5, 20, 2, 1) / 2.41936e-4 - 1).toBeCloseTo(0, 5) // quoted to 6 significant figures
  })

  it('for odd N equals 1/[N b³/(12EI) + (N−1) a b²/(4EI)] (REFERENCES §6, Castigliano, bending only)', () => {
    for (const [N, a, b] of [[3, 1, 10], [7, 3, 15], [15, 2.5, 40]]) {
      expect(castiglianoStiffness(N, b, a, 1)).toBeCloseTo(1 / ((N * b ** 3) / 12 + ((N - 1) * a * b * b) / 4), 12)
    }
  })

  it('one span is a fixed-guided beam, 12EI/b³ (Roark 7th ed.), and a → 0 gives 12EI/(N b³) (REFERENCES §6)', () => {
    expect(castiglianoStiffness(1, 20, 2, 1)).toBeCloseTo(12 / 8000, 15)
    expect(castiglianoStiffness(4, 20, 1e-9, 1)).toBeCloseTo(12 / (4 * 8000), 12)
  })

  it('even N: the centroid moves towards the side with more connectors (N/2 at y = b, N/2 − 1 at y = 0)', () => {
    const observed = meanderMoments(4, 20, 2)
    expect(observed.centroid).toBeCloseTo((4 * 20 * 10 + 2 * 2 * 20) / (4 * 20 + 3 * 2), 12)
    // direct sum of ∫(y − ȳ)² over spans and connectors
    const c = observed.centroid
    const expected = 4 * ((20 - c) ** 3 + c ** 3) / 3 + 2 * (2 * (20 - c) ** 2 + 1 * c * c)
    expect(observed.secondMoment).toBeCloseTo(expected, 9)
  })

  it('refuses a pitch that leaves no printable gap between spans, naming pitch', () => {
    expect(issuesOf('serpentine-spring', { pitch: 1, thickness: 0.8 })[0].field).toBe('pitch')
    expect(issuesOf('serpentine-spring', { spans: 2.5 })[0].message).toMatch(/whole number/)
  })
})

describe('serpentine-spring: solver against Castigliano', () => {
  const E = 2000
  const spring = { spans: 5, spanLength: 20, pitch: 2, thickness: 0.5, depth: 6 }
  const EI = (E * 6 * 0.5 ** 3) / 12

  it.each([2, 3, 5, 8])('N = %i: small-travel stiffness within 0.1 % of the formula (bending only; the solver adds axial and is otherwise exact)', (spans) => {
    const params = { ...spring, spans }
    const path = solveMeander(params, E, 0.01)
    const observed = path.reaction[1] / path.control[1]
    expect(Math.abs(observed / castiglianoStiffness(spans, 20, 2, EI) - 1)).toBeLessThan(1e-3)
  })

  it('stiffens at large elongation as the spans turn (geometric nonlinearity; common practice)', () => {
    const observed = evaluate('serpentine-spring', { ...spring, modulus: E, strainLimit: 0.03 }, { method: 'nonlinear-fe' })
    const last = observed.curve.force.length - 1
    const secant = observed.curve.force[last] / observed.curve.displacement[last]
    expect(secant).toBeGreaterThan(1.03 * (observed.metrics.stiffness as number))
    expect(evaluate('serpentine-spring', { ...spring, modulus: E, strainLimit: 0.03 }, { method: 'castigliano' }).warnings.join(' ')).toMatch(/stiffens/)
  })

  it('mesh: the default 8 elements per span are within 0.2 % of 16 at the largest travel', () => {
    const coarse = solveMeander(spring, E, 20)
    const fine = solveMeander(spring, E, 20, 16, 4)
    const last = coarse.control.length - 1
    expect(coarse.control[last]).toBeCloseTo(20, 9)
    expect(Math.abs(coarse.reaction[last] / fine.reaction[last] - 1)).toBeLessThan(2e-3)
  })

  it('through the core with defaults: strain limit reached inside the curve, force against elongation', () => {
    const observed = evaluate('serpentine-spring', {})
    expect(observed.method).toBe('nonlinear-fe')
    expect(observed.curve.axes.displacement).toEqual({ label: 'Elongation', unit: 'mm' })
    expect(observed.metrics.maxStrain).toBeCloseTo(0.02, 6)
    expect(observed.curve.strain!.at(-1) as number).toBeGreaterThan(0.02)
  })
})

describe('serpentine-spring properties', () => {
  const arbitrary = fc.record({
    spans: fc.integer({ min: 2, max: 15 }),
    spanLength: fc.double({ min: 3, max: 60, noNaN: true }),
    thicknessShare: fc.double({ min: 0.005, max: 0.125, noNaN: true }),
    gap: fc.double({ min: 0.4, max: 10, noNaN: true }),
    depth: fc.double({ min: 1, max: 40, noNaN: true }),
  }).map(({ thicknessShare, gap, ...p }) => {
    const thickness = Math.min(4, Math.max(0.3, thicknessShare * p.spanLength))
    return { ...p, thickness, pitch: Math.min(20, Math.max(0.8, thickness + gap)) }
  })

  it('random valid parameters give finite results (Castigliano)', () => {
    fc.assert(fc.property(validParams('serpentine-spring', arbitrary), (p) => expectFiniteResults('serpentine-spring', p, 'castigliano')), { numRuns: 150 })
  })

  it('random valid parameters give finite results (solver)', () => {
    fc.assert(fc.property(validParams('serpentine-spring', arbitrary), (p) => expectFiniteResults('serpentine-spring', p, 'nonlinear-fe')), { numRuns: 10 })
  })

  it('a value outside any field\u2019s range is refused with a message naming the field', () => {
    checkRefusesOutOfRange('serpentine-spring')
  })
})
