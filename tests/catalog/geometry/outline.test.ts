import { describe, expect, it } from 'vitest'
import { BEAM_SEGMENTS, cosineBeamPoints, cosineCentreline, holePolygonArea } from '../../../catalog/geometry/outline'
import { cosineArcLength, shoelace } from './analytic'

describe('cosine beam outline', () => {
  const span = 40
  const apexHeight = 3
  const thickness = 0.6
  const points = cosineBeamPoints({ span, apexHeight, thickness })
  const n = BEAM_SEGMENTS + 1
  const lower = points.slice(0, n)
  const upper = points.slice(n).reverse()

  it('follows w0 = (h/2)(1 − cos 2πx/l): zero at the ends, apexHeight at mid-span (Qiu, Lang & Slocum 2004)', () => {
    expect(cosineCentreline(0, span, apexHeight).y).toBe(0)
    expect(cosineCentreline(span / 2, span, apexHeight).y).toBeCloseTo(apexHeight, 12)
    expect(cosineCentreline(span / 4, span, apexHeight).y).toBeCloseTo(apexHeight / 2, 12)
    const mid = BEAM_SEGMENTS / 2
    const observed = (lower[mid][1] + upper[mid][1]) / 2
    expect(observed).toBeCloseTo(apexHeight, 12)
  })

  it('keeps the thickness normal to the centreline at every sample', () => {
    for (let i = 0; i < n; i++) {
      const observed = Math.hypot(upper[i][0] - lower[i][0], upper[i][1] - lower[i][1])
      expect(observed).toBeCloseTo(thickness, 12)
      const x = (lower[i][0] + upper[i][0]) / 2
      const { slope } = cosineCentreline(x, span, apexHeight)
      // the offset direction is perpendicular to the tangent (1, slope)
      expect((upper[i][0] - lower[i][0]) + slope * (upper[i][1] - lower[i][1])).toBeCloseTo(0, 9)
    }
  })

  it('encloses thickness × arc length (area of a parallel strip), within the chord error of its segments', () => {
    const expected = thickness * cosineArcLength(span, apexHeight, 0, span)
    const observed = shoelace(points)
    // each chord of length s on a curve of curvature κ cuts κ s³/12; two sides, BEAM_SEGMENTS each
    const kappa = (apexHeight / 2) * ((2 * Math.PI) / span) ** 2 / (1 - ((apexHeight / 2) * ((2 * Math.PI) / span) ** 2 * thickness) / 2)
    const s = (span / BEAM_SEGMENTS) * 1.03
    const bound = 2 * BEAM_SEGMENTS * (kappa * s ** 3) / 12
    expect(Math.abs(observed - expected)).toBeLessThanOrEqual(bound)
    expect(bound / expected).toBeLessThan(5e-4)
  })

  it('continues straight and level into the anchors', () => {
    const extended = cosineBeamPoints({ span, apexHeight, thickness, yOffset: 5, extension: 2 })
    const expected = shoelace(points) + 2 * 2 * thickness
    expect(shoelace(extended)).toBeCloseTo(expected, 9)
    expect(Math.min(...extended.map((p) => p[0]))).toBe(-2)
    expect(Math.max(...extended.map((p) => p[0]))).toBe(span + 2)
  })
})

describe('mounting hole polygon', () => {
  it('a 64-gon of a 3.2 mm hole is 0.16 % short of πr² ((n/2) sin(2π/n) r²)', () => {
    const observed = holePolygonArea(3.2)
    const expected = Math.PI * 1.6 ** 2
    expect(1 - observed / expected).toBeCloseTo(1 - (32 * Math.sin(Math.PI / 32)) / Math.PI, 12)
    expect(1 - observed / expected).toBeLessThan(0.0017)
  })
})
