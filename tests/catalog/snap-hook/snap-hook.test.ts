import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog/index'
import { deflectionForce, permissibleDeflection, rootStrainAt, taperFactor, taperIntegral, wedgeForce } from '../../../catalog/families/snap-hook/model'
import { checkRefusesOutOfRange, expectFiniteResults, issuesOf, validParams } from '../leaf-hinge/property-helpers'

// Worked check of the standard snap-fit design equations (REFERENCES §5, computed from the formulas
// in the plastics suppliers' snap-fit design guides and Bonenberger, The First Snap-Fit Handbook, 2005).
const worked = { length: 20, h: 2, width: 10, strain: 0.02, modulus: 2000 }

describe('snap-hook: snap-fit design equations', () => {
  it('permissible deflection of a prismatic arm, y = (2/3)·ε·l²/h = 2.667 mm (snap-fit guides; REFERENCES §5)', () => {
    const observed = permissibleDeflection(worked.strain, worked.length, worked.h)
    expect(observed).toBeCloseTo(2.667, 3)
  })

  it('deflection force P = b h² E ε/(6 l) = 13.333 N at the permissible deflection (snap-fit guides; REFERENCES §5)', () => {
    const y = permissibleDeflection(worked.strain, worked.length, worked.h)
    const observed = deflectionForce(worked.modulus, worked.width, worked.h, worked.length, y)
    const expected = (worked.width * worked.h ** 2 * worked.modulus * worked.strain) / (6 * worked.length)
    expect(observed).toBeCloseTo(13.333, 3)
    expect(observed).toBeCloseTo(expected, 9)
  })

  it.each([
    [0.5, 30, 20.194],
    [0.3, 30, 14.149],
    [0.5, 45, 40.0],
  ])('mating force W = P(μ + tan α)/(1 − μ tan α) with μ %f, α %f° is %f N (REFERENCES §5 worked check)', (mu, angle, expected) => {
    const P = deflectionForce(worked.modulus, worked.width, worked.h, worked.length, permissibleDeflection(worked.strain, worked.length, worked.h))
    expect(wedgeForce(P, mu, angle)).toBeCloseTo(expected, 3)
  })

  it('mating force at zero friction is P·tan α (the wedge relation with μ = 0)', () => {
    fc.assert(fc.property(fc.double({ min: 0.1, max: 100, noNaN: true }), fc.double({ min: 1, max: 85, noNaN: true }), (P, angle) => {
      const observed = wedgeForce(P, 0, angle) as number
      expect(observed).toBeCloseTo(P * Math.tan((angle * Math.PI) / 180), 9)
    }))
  })

  it('the face locks at 90° and where μ·tan α reaches 1 (denominator of the wedge relation)', () => {
    expect(wedgeForce(10, 0, 90)).toBeNull()
    const locking = (Math.atan(1 / 0.5) * 180) / Math.PI // μ tan α = 1 at α = 63.43° for μ = 0.5
    expect(wedgeForce(10, 0.5, locking + 0.01)).toBeNull()
    expect(wedgeForce(10, 0.5, locking - 1)).toBeGreaterThan(100)
  })

  it('taper factor 2/3 for a prismatic arm and ≈ 1.09 for a taper to h/2 (values printed in the snap-fit guides; REFERENCES §5)', () => {
    expect(taperFactor(1)).toBeCloseTo(2 / 3, 12)
    expect(taperFactor(0.5)).toBeCloseTo(1.09, 2)
  })

  it('taper integral equals a numerical integration of ∫(1 − ξ)²/(1 − (1 − r)ξ)³ dξ (beam integral, Simpson rule) across the range, continuous at the series switch', () => {
    for (const r of [0.5, 0.6, 0.75, 0.899, 0.9, 0.901, 0.95, 0.999, 1]) {
      const n = 2000
      let sum = 0
      for (let i = 0; i <= n; i++) {
        const xi = i / n
        const w = i === 0 || i === n ? 1 : i % 2 ? 4 : 2
        sum += (w * (1 - xi) ** 2) / (1 - (1 - r) * xi) ** 3
      }
      expect(taperIntegral(r)).toBeCloseTo(sum / (3 * n), 10)
    }
  })

  it('root strain of a prismatic arm is 3hy/(2l²) (cantilever beam theory, ε = 6Pl/(Ebh²) with P = 3EIy/l³)', () => {
    expect(rootStrainAt(2, 20, 2)).toBeCloseTo((3 * 2 * 2) / (2 * 400), 12)
  })
})

describe('snap-hook through the core entrance', () => {
  // wideBeam 'off': the worked check is the snap-fit guide's plain beam theory, and its 10 mm arm is
  // 5 × its 2 mm root, wide by the rule (the plate factor is checked in tests/catalog/mechanics)
  const params = { length: 20, rootThickness: 2, tipThickness: 2, width: 10, undercut: 8 / 3, entryAngle: 30, retainAngle: 45, friction: 0.5, modulus: 2000, strainLimit: 0.02, wideBeam: 'off' }

  it('reproduces the worked check: P 13.333 N, W 20.194 N, separation 40.000 N at 45°, root strain 2 % (REFERENCES §5)', () => {
    const observed = evaluate('snap-hook', params)
    expect(observed.method).toBe('snap-fit-equations')
    expect(observed.metrics.deflectionForce).toBeCloseTo(13.333, 3)
    expect(observed.metrics.matingForce).toBeCloseTo(20.194, 3)
    expect(observed.metrics.separationForce).toBeCloseTo(40.0, 3)
    expect(observed.metrics.rootStrain).toBeCloseTo(0.02, 9)
    expect(observed.metrics.safetyFactor).toBeCloseTo(1, 9)
    expect(observed.curve.axes.displacement).toEqual({ label: 'Insertion travel', unit: 'mm' })
    // the curve ends where the entry face has pushed the arm aside by the undercut
    expect(observed.curve.displacement.at(-1)).toBeCloseTo((8 / 3) / Math.tan(Math.PI / 6), 9)
    expect(observed.curve.force.at(-1)).toBeCloseTo(20.194, 3)
  })

  it('a locking retaining face gives a null separation force and a warning', () => {
    const observed = evaluate('snap-hook', { ...params, retainAngle: 90 })
    expect(observed.metrics.separationForce).toBeNull()
    expect(observed.warnings.join(' ')).toMatch(/locks/)
    const steep = evaluate('snap-hook', { ...params, retainAngle: 70 }) // 0.5·tan 70° = 1.37 > 1
    expect(steep.metrics.separationForce).toBeNull()
  })

  it('warns when the undercut strains the root past the limit', () => {
    const observed = evaluate('snap-hook', { ...params, strainLimit: 0.015 })
    expect(observed.metrics.safetyFactor as number).toBeLessThan(1)
    expect(observed.warnings.join(' ')).toMatch(/exceeds the strain limit/)
  })

  it('refuses a tip thicker than the root, a taper below h/2 and an entry face that jams, naming the field', () => {
    expect(issuesOf('snap-hook', { tipThickness: 2 })[0].field).toBe('tipThickness')
    expect(issuesOf('snap-hook', { rootThickness: 3, tipThickness: 1 })[0].message).toMatch(/at least half/)
    expect(issuesOf('snap-hook', { friction: 1, entryAngle: 45 })[0]).toMatchObject({ field: 'entryAngle' })
  })

  it('accepts {} and returns finite metrics', () => {
    expectFiniteResults('snap-hook', {}, 'snap-fit-equations', ['separationForce'])
  })
})

describe('snap-hook properties', () => {
  const arbitrary = fc.record({
    length: fc.double({ min: 4, max: 60, noNaN: true }),
    rootThickness: fc.double({ min: 0.8, max: 6, noNaN: true }),
    taper: fc.double({ min: 0.5, max: 1, noNaN: true }),
    width: fc.double({ min: 1, max: 40, noNaN: true }),
    undercutShare: fc.double({ min: 0.005, max: 0.33, noNaN: true }),
    entryAngle: fc.double({ min: 5, max: 75, noNaN: true }),
    retainAngle: fc.double({ min: 5, max: 90, noNaN: true }),
    friction: fc.double({ min: 0, max: 1, noNaN: true }),
  }).map(({ taper, undercutShare, ...p }) => ({
    ...p,
    tipThickness: Math.max(0.4, p.rootThickness * taper),
    undercut: Math.min(10, Math.max(0.1, p.length * undercutShare)),
  }))

  it('random valid parameters give finite results (separation force may be null)', () => {
    fc.assert(fc.property(validParams('snap-hook', arbitrary), (p) => expectFiniteResults('snap-hook', p, 'snap-fit-equations', ['separationForce'])), { numRuns: 150 })
  })

  it('a value outside any field\u2019s range is refused with a message naming the field', () => {
    checkRefusesOutOfRange('snap-hook')
  })
})
