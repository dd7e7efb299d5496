import { describe, expect, it } from 'vitest'
import { curveMarkers, peakPoint, valleyPoint, zeroCrossings } from '../curveMarkers'

// F(x) = x(x−1)(x−2): roots 0, 1, 2; F'(x) = 3x² − 6x + 2 is +2, −1, +2 there, so the roots are
// stable, unstable, stable (equilibrium is stable where the stiffness dF/dx is positive, i.e. at
// a minimum of the potential energy — Lagrange–Dirichlet). The maximum on [0, 1] is at
// x = 1 − 1/√3 with F = 2/(3√3) (calculus, F' = 0).
function cubic(n: number) {
  const displacement = Array.from({ length: n }, (_, i) => (2 * i) / (n - 1))
  return { displacement, force: displacement.map((x) => x * (x - 1) * (x - 2)) }
}

describe('zeroCrossings', () => {
  it('finds the three equilibria of x(x−1)(x−2) with their direction', () => {
    const { displacement, force } = cubic(201)
    const observed = zeroCrossings(displacement, force)
    expect(observed.map((c) => c.direction)).toEqual([1, -1])
    expect(observed[0].x).toBe(0)
    expect(observed[1].x).toBeCloseTo(1, 9)
  })

  it('interpolates linearly between samples', () => {
    const observed = zeroCrossings([0, 1, 2], [1, 1, -3])
    expect(observed).toEqual([{ x: 1.25, direction: -1 }])
  })

  it('counts a run of exact zeros once, at its first point', () => {
    const observed = zeroCrossings([0, 1, 2, 3, 4], [2, 0, 0, -1, -2])
    expect(observed).toEqual([{ x: 1, direction: -1 }])
  })

  it('finds nothing on an all-zero or single-point curve', () => {
    expect(zeroCrossings([0, 1], [0, 0])).toEqual([])
    expect(zeroCrossings([0], [0])).toEqual([])
  })

  it('does not treat solver round-off near zero as a crossing', () => {
    expect(zeroCrossings([0, 1, 2], [5, 1e-12, 3])).toEqual([])
  })
})

describe('peakPoint / valleyPoint', () => {
  it('finds the extremes of x(x−1)(x−2) to sampling accuracy', () => {
    const { displacement, force } = cubic(2001)
    const peak = peakPoint(displacement, force)!
    const valley = valleyPoint(displacement, force)!
    expect(peak.x).toBeCloseTo(1 - 1 / Math.sqrt(3), 2)
    expect(peak.y).toBeCloseTo(2 / (3 * Math.sqrt(3)), 5)
    expect(valley.x).toBeCloseTo(1 + 1 / Math.sqrt(3), 2)
    expect(valley.y).toBeCloseTo(-2 / (3 * Math.sqrt(3)), 5)
  })
  it('answers null for an empty curve', () => {
    expect(peakPoint([], [])).toBeNull()
  })
})

describe('curveMarkers', () => {
  it('marks start and end as stable, the middle root as unstable, and peak and valley', () => {
    const curve = cubic(201)
    // the end point is an exact root: extend one sample past it so the rise through zero is seen
    curve.displacement.push(2.01)
    curve.force.push(2.01 * 1.01 * 0.01)
    const observed = curveMarkers(curve)
    expect(observed.map((m) => m.kind)).toEqual(['stable', 'unstable', 'stable', 'peak', 'valley'])
    expect(observed[2].x).toBeCloseTo(2, 6)
  })

  it('places equilibria at the solver positions given in the metrics', () => {
    const curve = cubic(21)
    curve.displacement.push(2.1)
    curve.force.push(2.1 * 1.1 * 0.1)
    const observed = curveMarkers(curve, { unstablePosition: 0.998, secondStablePosition: 1.997, peakForce: 0.38 })
    expect(observed.find((m) => m.kind === 'unstable')!.x).toBe(0.998)
    expect(observed.filter((m) => m.kind === 'stable').map((m) => m.x)).toEqual([0, 1.997])
  })

  it('marks only the peak on a monotonic hinge curve that never returns', () => {
    const observed = curveMarkers({ displacement: [0, 10, 20, 30], force: [0, 4, 7, 9] })
    expect(observed).toEqual([{ kind: 'stable', x: 0, y: 0 }, { kind: 'peak', x: 30, y: 9 }])
  })

  it('marks no valley when the force never turns negative (springs back, not bistable)', () => {
    const observed = curveMarkers({ displacement: [0, 1, 2, 3], force: [0, 3, 2, 1] })
    expect(observed.some((m) => m.kind === 'valley')).toBe(false)
    expect(observed.some((m) => m.kind === 'unstable')).toBe(false)
  })
})
