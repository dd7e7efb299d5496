import { describe, expect, it } from 'vitest'
import { closedFormForce, closedFormMetrics, CRITICAL_Q, modeOneForce } from '../../../catalog/families/bistable-beam/closed-form'

describe('bistable-beam closed form (Qiu, Lang & Slocum, J. MEMS 13(2), 2004)', () => {
  it('the pair becomes bistable at Q = √(16/3) = 2.3094 (Qiu et al. 2004)', () => {
    expect(CRITICAL_Q).toBeCloseTo(2.3094, 4)
    expect(closedFormMetrics(CRITICAL_Q * 0.999).valley).toBeGreaterThan(0)
    expect(closedFormMetrics(CRITICAL_Q * 1.001).valley).toBeLessThan(0)
    expect(closedFormMetrics(CRITICAL_Q * 0.999).secondAt).toBeNull()
  })

  // REFERENCES.md §1 check values, computed from the published two-mode formulas
  const checkValues = [
    { q: 3, top: 567.87, topAt: 0.3617, bottom: -178.23, bottomAt: 1.6383, second: 1.8191 },
    { q: 4, top: 672.02, topAt: 0.1835, bottom: -282.39, bottomAt: 1.8165, second: 1.9082 },
    { q: 6, top: 734.25, topAt: 0.077, bottom: -344.61, bottomAt: 1.923, second: 1.9615 },
    { q: 10, top: 763.47, topAt: 0.027, bottom: -373.84, bottomAt: 1.973, second: 1.9865 },
  ]
  for (const c of checkValues) {
    it(`Q = ${c.q}: f_top, f_bottom and zeros match the check-value table (REFERENCES.md §1, computed from Qiu et al. 2004)`, () => {
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

  it('the mode-1-only curve for Q = 6 peaks at f = 2108 (REFERENCES.md §1)', () => {
    let peak = 0
    for (let d = 0; d <= 2; d += 1e-4) peak = Math.max(peak, modeOneForce(6, d))
    expect(peak).toBeCloseTo(2108, -1)
  })

  it('the path force is continuous where it meets and leaves the mode-3 line', () => {
    const m = closedFormMetrics(5)
    for (const d of [m.peakAt, m.valleyAt]) expect(closedFormForce(5, d - 1e-9)).toBeCloseTo(closedFormForce(5, d + 1e-9), 4)
  })
})
