import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { main } from '../../../catalog/cli'
import { evaluate } from '../../../catalog/index'
import { parosWeisbordCompliance, parosWeisbordSimplifiedCompliance, solveNotch } from '../../../catalog/families/notch-hinge/model'
import { checkRefusesOutOfRange, expectFiniteResults, issuesOf, validParams } from '../leaf-hinge/property-helpers'

// Compliance × E b R² of a circular notch, R = 1 (REFERENCES §4, computed from Paros & Weisbord,
// Machine Design 37:151–156, 1965; the same integral in Lobontiu, CRC 2003).
const table: Array<[number, number, number]> = [
  [0.05, 25129.5, 25289.3],
  [0.1, 4413.63, 4470.56],
  [0.2, 769.998, 790.292],
  [0.5, 74.8585, 79.9719],
  [1.0, 12.4091, 14.1372],
]

describe('notch-hinge: Paros–Weisbord closed forms', () => {
  it.each(table)('t/R = %f: full %f and simplified %f (Paros & Weisbord 1965; REFERENCES §4 table)', (tr, full, simplified) => {
    expect(parosWeisbordCompliance(1, 1, 1, tr) / full - 1).toBeCloseTo(0, 5)
    expect(parosWeisbordSimplifiedCompliance(1, 1, 1, tr) / simplified - 1).toBeCloseTo(0, 5)
  })

  it('scales as 1/(E b R²) at fixed t/R (Paros & Weisbord prefactor 3/(2EbR²), not 12/(EbR²))', () => {
    const observed = parosWeisbordCompliance(2000, 8, 3, 0.6) * 2000 * 8 * 9
    expect(observed).toBeCloseTo(parosWeisbordCompliance(1, 1, 1, 0.2), 6)
  })

  it('the simplified form meets the full one as t/R → 0 (Paros & Weisbord thin-neck limit)', () => {
    const observed = parosWeisbordSimplifiedCompliance(1, 1, 1, 1e-4) / parosWeisbordCompliance(1, 1, 1, 1e-4)
    expect(observed).toBeCloseTo(1, 3)
  })

  it('largest rotation is where the neck strain 6M/(Ebt²) reaches the limit (beam theory at the neck)', () => {
    // wideBeam 'off': Paros–Weisbord is written with E alone (the plate factor: tests/catalog/mechanics)
    const observed = evaluate('notch-hinge', { radius: 3, neckThickness: 0.8, depth: 8, blockThickness: 8, modulus: 2000, strainLimit: 0.02, wideBeam: 'off' }, { method: 'paros-weisbord' })
    const C = parosWeisbordCompliance(2000, 8, 3, 0.8)
    const expected = C * (0.02 * 2000 * 8 * 0.64) / 6 * (180 / Math.PI)
    expect(observed.metrics.maxRotation).toBeCloseTo(expected, 9)
    expect(observed.metrics.rotationalStiffness).toBeCloseTo(1 / C, 9)
    expect(observed.curve.axes.displacement).toEqual({ label: 'Rotation', unit: 'deg' })
    expect(observed.curve.axes.force).toEqual({ label: 'Moment', unit: 'N·mm' })
  })

  it('warns that the thin-neck form is off for a thick neck, and names the full form', () => {
    const observed = evaluate('notch-hinge', { radius: 2, neckThickness: 2, blockThickness: 8 }, { method: 'paros-weisbord-simplified' })
    expect(observed.warnings.join(' ')).toMatch(/overstates the compliance by 14 %/)
    expect(evaluate('notch-hinge', { radius: 5, neckThickness: 0.5, blockThickness: 12 }, { method: 'paros-weisbord-simplified' }).warnings).toEqual([])
  })

  it('refuses a neck as thick as the block, naming neckThickness', () => {
    expect(issuesOf('notch-hinge', { neckThickness: 8, blockThickness: 8 }).map((i) => i.field)).toContain('neckThickness')
  })
})

describe('notch-hinge: solver on the stepped notch against Paros–Weisbord', () => {
  it('converges to the full closed form as the stepped mesh is refined (second order in the element size)', () => {
    const params = { radius: 2, neckThickness: 0.4, depth: 8, blockThickness: 6 }
    const C = parosWeisbordCompliance(2000, 8, 2, 0.4)
    const error = (n: number) => {
      const path = solveNotch(params, 2000, 0.05, n)
      return Math.abs(path.control[4] / path.reaction[4] / C - 1)
    }
    const coarse = error(20)
    const fine = error(40)
    expect(fine).toBeLessThan(coarse / 3) // halving h cuts a midpoint-rule error about fourfold
    expect(fine).toBeLessThan(1e-3)
  })

  it('default mesh agrees with the full Paros–Weisbord stiffness within 0.2 % over t/R 0.1–1 (exact integral vs stepped mesh, 40 elements)', () => {
    for (const tr of [0.1, 0.3, 1]) {
      const params = { radius: 3, neckThickness: 3 * tr, depth: 8, blockThickness: 6 + 3 * tr + 2, modulus: 2000, strainLimit: 0.02 }
      const fe = evaluate('notch-hinge', params, { method: 'nonlinear-fe' })
      const cf = evaluate('notch-hinge', params, { method: 'paros-weisbord' })
      expect(Math.abs((fe.metrics.rotationalStiffness as number) / (cf.metrics.rotationalStiffness as number) - 1)).toBeLessThan(2e-3)
      expect(Math.abs((fe.metrics.maxRotation as number) / (cf.metrics.maxRotation as number) - 1)).toBeLessThan(2e-3)
    }
  })

  it('under a pure moment the curve stays linear (beam theory: curvature M/EI integrates to the rotation)', () => {
    const fe = evaluate('notch-hinge', {}, { method: 'nonlinear-fe' })
    const slopes = fe.curve.force.slice(1).map((m, i) => m / fe.curve.displacement[i + 1])
    expect(Math.max(...slopes) / Math.min(...slopes) - 1).toBeLessThan(1e-3)
  })

  it('a shallow notch (block thinner than t + 2R) is stiffer than the half-circle closed form and is warned about', () => {
    const params = { radius: 3, neckThickness: 0.8, depth: 8, blockThickness: 3 }
    const fe = evaluate('notch-hinge', params, { method: 'nonlinear-fe' })
    const cf = evaluate('notch-hinge', params, { method: 'paros-weisbord' })
    expect(fe.metrics.rotationalStiffness as number).toBeGreaterThan(cf.metrics.rotationalStiffness as number)
    expect(cf.warnings.join(' ')).toMatch(/shallower than half circles/)
  })
})

describe('notch-hinge through the command line', () => {
  function capture<T>() {
    let text = ''
    return { stream: { write: (s: string) => { text += s; return true } } as unknown as T, text: () => text }
  }

  it('evaluate prints the JSON result with the chosen method', async () => {
    const out = capture<typeof process.stdout>()
    const err = capture<typeof process.stderr>()
    // wideBeam "off": the expected compliance below is Paros–Weisbord with E alone
    const code = await main(['evaluate', 'notch-hinge', '{"radius":3,"neckThickness":0.6,"wideBeam":"off"}', '--method', 'paros-weisbord-simplified'], out.stream, err.stream)
    expect(code).toBe(0)
    const observed = JSON.parse(out.text())
    expect(observed.family).toBe('notch-hinge')
    expect(observed.method).toBe('paros-weisbord-simplified')
    expect(observed.metrics.rotationalStiffness).toBeCloseTo(1 / parosWeisbordSimplifiedCompliance(2000, 8, 3, 0.6), 6)
  })

  it('bad input prints one line per field on stderr and exits 1', async () => {
    const out = capture<typeof process.stdout>()
    const err = capture<typeof process.stderr>()
    const code = await main(['evaluate', 'notch-hinge', '{"radius":-1,"depth":"wide"}'], out.stream, err.stream)
    expect(code).toBe(1)
    expect(err.text()).toMatch(/^radius: /m)
    expect(err.text()).toMatch(/^depth: /m)
    expect(out.text()).toBe('')
  })
})

describe('notch-hinge properties', () => {
  const arbitrary = fc.record({
    radius: fc.double({ min: 0.5, max: 20, noNaN: true }),
    neckShare: fc.double({ min: 0.01, max: 1.5, noNaN: true }),
    depth: fc.double({ min: 1, max: 60, noNaN: true }),
    blockThickness: fc.double({ min: 1, max: 60, noNaN: true }),
  }).map(({ neckShare, ...p }) => ({ ...p, neckThickness: Math.min(10, Math.max(0.3, neckShare * p.radius)) }))

  it('random valid parameters give finite results with the closed forms', () => {
    fc.assert(fc.property(validParams('notch-hinge', arbitrary), (p) => {
      expectFiniteResults('notch-hinge', p, 'paros-weisbord')
      expectFiniteResults('notch-hinge', p, 'paros-weisbord-simplified')
    }), { numRuns: 150 })
  })

  it('random valid parameters give finite results with the solver', () => {
    fc.assert(fc.property(validParams('notch-hinge', arbitrary), (p) => expectFiniteResults('notch-hinge', p, 'nonlinear-fe')), { numRuns: 15 })
  })

  it('a value outside any field\u2019s range is refused with a message naming the field', () => {
    checkRefusesOutOfRange('notch-hinge')
  })
})
