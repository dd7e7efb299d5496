import { describe, expect, it } from 'vitest'
import { closedFormForce, closedFormMetrics, CRITICAL_Q, modeOneForce } from '../../../catalog/families/bistable-beam/closed-form'
import { evaluate } from '../../../catalog'
import { closedFormRegime } from '../../../catalog/families/bistable-beam/model'

describe('bistable-beam closed form (Qiu, Lang & Slocum, J. MEMS 13(2), 2004)', () => {
  it('the pair becomes bistable at Q = √(16/3) = 2.3094 (Qiu et al. 2004)', () => {
    expect(CRITICAL_Q).toBeCloseTo(2.3094, 4)
    expect(closedFormMetrics(CRITICAL_Q * 0.999).valley).toBeGreaterThan(0)
    expect(closedFormMetrics(CRITICAL_Q * 1.001).valley).toBeLessThan(0)
    expect(closedFormMetrics(CRITICAL_Q * 0.999).secondAt).toBeNull()
  })

  // check values computed from the two-mode formulas of Qiu, Lang & Slocum, J. MEMS 13(2), 2004 (listed in docs/references.md §1)
  const checkValues = [
    { q: 3, top: 567.87, topAt: 0.3617, bottom: -178.23, bottomAt: 1.6383, second: 1.8191 },
    { q: 4, top: 672.02, topAt: 0.1835, bottom: -282.39, bottomAt: 1.8165, second: 1.9082 },
    { q: 6, top: 734.25, topAt: 0.077, bottom: -344.61, bottomAt: 1.923, second: 1.9615 },
    { q: 10, top: 763.47, topAt: 0.027, bottom: -373.84, bottomAt: 1.973, second: 1.9865 },
  ]
  for (const c of checkValues) {
    it(`Q = ${c.q}: f_top, f_bottom and zeros match the check-value table (computed from Qiu, Lang & Slocum 2004)`, () => {
      const observed = closedFormMetrics(c.q)
      expect(observed.peak).toBeCloseTo(c.top, 1)
      expect(observed.peakAt).toBeCloseTo(c.topAt, 3)
      expect(observed.valley).toBeCloseTo(c.bottom, 1)
      expect(observed.valleyAt).toBeCloseTo(c.bottomAt, 3)
      expect(observed.unstableAt).toBeCloseTo(4 / 3, 4)
      expect(observed.secondAt).toBeCloseTo(c.second, 4)
    })
  }

  it('for large Q the peak tends to 8π⁴ = 779.3 and the valley to −4π⁴ = −389.6 (Qiu et al. 2004)', () => {
    const observed = closedFormMetrics(1000)
    expect(observed.peak / (8 * Math.PI ** 4)).toBeCloseTo(1, 4)
    expect(observed.valley / (-4 * Math.PI ** 4)).toBeCloseTo(1, 4)
  })

  it('the mode-1-only curve for Q = 6 peaks at f = 2108 (computed from the mode-1 formula of Qiu, Lang & Slocum 2004)', () => {
    let peak = 0
    for (let d = 0; d <= 2; d += 1e-4) peak = Math.max(peak, modeOneForce(6, d))
    expect(peak).toBeCloseTo(2108, -1)
  })

  it('the path force is continuous where it meets and leaves the mode-3 line', () => {
    const m = closedFormMetrics(5)
    for (const d of [m.peakAt, m.valleyAt]) expect(closedFormForce(5, d - 1e-9)).toBeCloseTo(closedFormForce(5, d + 1e-9), 4)
  })
})

describe('closed form: the caution states its measured error by regime', () => {
  // rigid ends, t = 0.8 mm: two parts in each regime of the rise h/l; nonlinear-fe is the
  // reference (checked on its own against published values in nonlinear-fe.test.ts)
  const cases: Array<[slenderness: number, ratio: number]> = [[100, 3], [150, 4], [60, 3], [100, 6], [60, 5], [100, 10], [40, 6], [60, 12]]
  for (const [S, Q] of cases) {
    it(`span/t ${S}, apexHeight/t ${Q}: the peak and valley error lie in the range the warning states`, () => {
      const t = 0.8
      const p = { span: S * t, apexHeight: Q * t, thickness: t, depth: 5, postLength: 0, modulus: 2000 }
      const fe = evaluate('bistable-beam', p).metrics
      const cf = evaluate('bistable-beam', p, { method: 'closed-form' })
      const peakHigh = (100 * ((cf.metrics.peakForce as number) - (fe.peakForce as number))) / (fe.peakForce as number)
      const valleyDeep = (100 * ((fe.valleyForce as number) - (cf.metrics.valleyForce as number))) / (fe.peakForce as number)
      const r = closedFormRegime(Q / S)
      expect(peakHigh).toBeGreaterThanOrEqual(r.peak[0])
      expect(peakHigh).toBeLessThanOrEqual(r.peak[1])
      expect(valleyDeep).toBeGreaterThanOrEqual(0)
      expect(valleyDeep).toBeLessThanOrEqual(r.valley)
      expect(cf.warnings.join(' ')).toContain(`the peak is ${r.peak[0]}–${r.peak[1]} % high and the valley up to ${r.valley} % of the peak too deep`)
    })
  }
})
