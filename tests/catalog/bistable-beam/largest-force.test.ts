/**
 * Peak force against largest force. The peak force is the first local maximum on the way in
 * (what snaps the switch over); the largest force is the maximum over the whole travel. On a
 * shallow arch that springs back (h/t below about 2.31: Qiu, Lang & Slocum, J. MEMS 13(2), 2004,
 * the bistability condition of the clamped double beam) the force dips after the first peak and
 * climbs past it towards twice the apex height, so the two differ; on a bistable one they agree.
 * Both are judged here from the returned curve, scanned by the test itself.
 */
import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog'

const base = { span: 60, thickness: 0.7, depth: 6, postLength: 0, material: 'petg' }

function firstLocalMaximum(f: number[]): number {
  for (let i = 1; i < f.length - 1; i++) if (f[i] >= f[i - 1] && f[i] > f[i + 1]) return f[i]
  return f[f.length - 1]
}

describe('bistable-beam: largest force over the travel', () => {
  for (const method of ['nonlinear-fe', 'closed-form']) {
    it(`differs from the first peak on a shallow arch that springs back (h/t = 1.6, ${method})`, () => {
      const e = evaluate('bistable-beam', { ...base, apexHeight: 1.6 * base.thickness }, { method })
      const f = e.curve.force
      expect(e.metrics.bistable).toBe(false)
      expect(e.metrics.peakForce).toBeCloseTo(firstLocalMaximum(f), 9)
      expect(e.metrics.largestForce).toBeCloseTo(Math.max(...f), 9)
      // the force climbs well past the first peak: the end of travel carries more
      expect(e.metrics.largestForce as number).toBeGreaterThan(1.2 * (e.metrics.peakForce as number))
      expect(e.metrics.largestForce).toBeCloseTo(f[f.length - 1], 9)
    })

    it(`equals the peak force on a bistable arch (h/t = 3, ${method})`, () => {
      const e = evaluate('bistable-beam', { ...base, apexHeight: 3 * base.thickness }, { method })
      expect(e.metrics.bistable).toBe(true)
      expect(e.metrics.largestForce).toBeCloseTo(e.metrics.peakForce as number, 9)
      expect(e.metrics.largestForce).toBeCloseTo(Math.max(...e.curve.force), 9)
    })
  }
})
