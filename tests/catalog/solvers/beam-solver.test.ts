import { describe, expect, it } from 'vitest'
import { SolverError } from '../../../catalog/errors'
import { bandFactor, bandSolve, createBandMatrix, bandAdd, followPath, meshCurve, meshStraight, rectangleSection, type Frame } from '../../../catalog/solvers'

const E = 2000
const section = rectangleSection(E, 1, 5)
const EI = E * section.inertia

/** Linear interpolation of ys at x along increasing xs. */
function at(xs: number[], ys: number[], x: number): number {
  const i = xs.findIndex((v) => v >= x)
  if (i < 1) throw new Error(`x = ${x} outside the path`)
  const s = (x - xs[i - 1]) / (xs[i] - xs[i - 1])
  return ys[i - 1] + s * (ys[i] - ys[i - 1])
}

describe('corotational beam solver', () => {
  it('clamped–clamped column loses stability at 4π²EI/L² (Euler; Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.3)', () => {
    const L = 100
    const column = meshStraight({ x: 0, y: 0 }, { x: L, y: 0 }, 16, section)
    const expected = (4 * Math.PI ** 2 * EI) / L ** 2
    const frame: Frame = { nodes: column.nodes, elements: column.elements, supports: [{ node: 0, dofs: [0, 1, 2] }, { node: column.last, dofs: [1, 2] }] }
    const shortening = (1.2 * expected * L) / (E * section.area)
    const path = followPath(frame, { control: { node: column.last, dof: 0 }, target: -shortening, points: 41, extrema: false })
    expect(path.stabilityLoss).toHaveLength(1)
    const observed = -path.stabilityLoss[0].reaction
    expect(Math.abs(observed / expected - 1)).toBeLessThan(2e-3)
    // stable below the critical load, unstable above it (the perfect column stays straight)
    const first = path.stable.indexOf(false)
    expect(-path.reaction[first - 1]).toBeLessThan(expected)
    expect(path.stable.slice(first).every((s) => !s)).toBe(true)
  })

  it('large-deflection cantilever matches the elastica tabulation of Bisshopp & Drucker, Quarterly of Applied Mathematics 3(3), 1945', () => {
    const L = 100
    const beam = meshStraight({ x: 0, y: 0 }, { x: L, y: 0 }, 16, section)
    const tip = beam.last
    const path = followPath({ nodes: beam.nodes, elements: beam.elements, supports: [{ node: 0, dofs: [0, 1, 2] }] }, {
      control: { node: tip, dof: 1 }, target: 0.82 * L, points: 329, track: [{ node: tip, dof: 0 }, { node: tip, dof: 2 }],
    })
    const alpha = path.reaction.map((P) => (P * L * L) / EI)
    const table = [
      [0.5, 0.1621, 0.0159, 14.01], [1, 0.3017, 0.0564, 26.43], [2, 0.4935, 0.1606, 44.79],
      [3, 0.6033, 0.2544, 56.5], [5, 0.7138, 0.3876, 69.64], [10, 0.8106, 0.555, 81.95],
    ]
    for (const [a, dv, dh, angle] of table) {
      const observed = {
        dv: at(alpha, path.control, a) / L,
        dh: -at(alpha, path.tracked[0], a) / L,
        angle: (at(alpha, path.tracked[1], a) * 180) / Math.PI,
      }
      expect(Math.abs(observed.dv - dv), `δv/L at α = ${a}`).toBeLessThan(1.5e-3)
      expect(Math.abs(observed.dh - dh), `δh/L at α = ${a}`).toBeLessThan(1.5e-3)
      expect(Math.abs(observed.angle - angle), `tip angle at α = ${a}`).toBeLessThan(0.15)
    }
  })

  it('fixed-guided beam has stiffness 12EI/L³ for small deflections (Roark 7th ed., fixed-guided beam)', () => {
    const L = 80
    const beam = meshStraight({ x: 0, y: 0 }, { x: L, y: 0 }, 4, section)
    const path = followPath({ nodes: beam.nodes, elements: beam.elements, supports: [{ node: 0, dofs: [0, 1, 2] }, { node: beam.last, dofs: [2] }] }, {
      control: { node: beam.last, dof: 1 }, target: 1e-4, points: 2,
    })
    const observed = path.reaction[1] / 1e-4
    const expected = (12 * EI) / L ** 3
    expect(Math.abs(observed / expected - 1)).toBeLessThan(1e-5)
  })

  it('a rigid link carries the load of a slave node to its master (two guided beams in parallel, 24EI/L³, Roark 7th ed.)', () => {
    const L = 80
    const lower = meshStraight({ x: 0, y: 0 }, { x: L, y: 0 }, 4, section)
    const upper = meshStraight({ x: 0, y: 10 }, { x: L, y: 10 }, 4, section, lower.nodes.length)
    const frame: Frame = {
      nodes: [...lower.nodes, ...upper.nodes], elements: [...lower.elements, ...upper.elements],
      supports: [{ node: lower.first, dofs: [0, 1, 2] }, { node: upper.first, dofs: [0, 1, 2] }, { node: lower.last, dofs: [2] }],
      rigidLinks: [{ master: lower.last, slave: upper.last }],
    }
    const path = followPath(frame, { control: { node: lower.last, dof: 1 }, target: 1e-4, points: 2 })
    expect(Math.abs(path.reaction[1] / 1e-4 / ((24 * EI) / L ** 3) - 1)).toBeLessThan(1e-4)
  })

  it('arc-length follows snap-back: the curve through a soft spring reverses and stays on the displacement-controlled path (series spring, u_D = u_c + F/k)', () => {
    const l = 40, h = 3, t = 0.5
    const sec = rectangleSection(E, t, 5)
    const arch = meshCurve((s) => ({ x: (s * l) / 2, y: (-h / 2) * (1 - Math.cos(Math.PI * s)) }), 12, sec)
    const imperfection = arch.nodes.map((p, i) => ({ node: i, dx: 0, dy: 1e-2 * t * (1 - Math.cos((4 * Math.PI * p.x) / l)) }))
    const mid = arch.last
    const supports: Frame['supports'] = [{ node: 0, dofs: [0, 1, 2] }, { node: mid, dofs: [0, 2] }]
    const reference = followPath({ nodes: arch.nodes, elements: arch.elements, supports }, { control: { node: mid, dof: 1 }, target: 2 * h, points: 601, imperfection })
    // a soft axial member (stiffness k) between the shuttle and the pushing point D
    const k = 0.2, length = 10, area = (k * length) / E
    const nodes = [...arch.nodes, { x: l / 2, y: -h + length }]
    const D = nodes.length - 1
    const frame: Frame = {
      nodes, elements: [...arch.elements, { nodes: [mid, D], section: { modulus: E, area, inertia: area, fibre: 0 } }],
      supports: [...supports, { node: D, dofs: [0, 2] }],
    }
    const path = followPath(frame, { control: { node: D, dof: 1 }, target: 2 * h + 3, points: 101, imperfection, strategy: 'arc-length', track: [{ node: mid, dof: 1 }] })
    let reversals = 0
    for (let i = 2; i < path.control.length; i++) {
      if (Math.sign(path.control[i] - path.control[i - 1]) !== Math.sign(path.control[i - 1] - path.control[i - 2])) reversals++
    }
    expect(reversals).toBeGreaterThanOrEqual(2)
    const peak = Math.max(...reference.reaction)
    for (let i = 0; i < path.control.length; i++) {
      const shuttle = path.tracked[0][i]
      expect(Math.abs(path.control[i] - shuttle - path.reaction[i] / k)).toBeLessThan(1e-9)
      if (shuttle > 0 && shuttle < 2 * h) expect(Math.abs(path.reaction[i] - at(reference.control, reference.reaction, shuttle)) / peak).toBeLessThan(2e-3)
    }
    expect(path.control.at(-1)).toBe(2 * h + 3)
  })

  it('reports non-convergence as SolverError naming the step and residual', () => {
    const beam = meshStraight({ x: 0, y: 0 }, { x: 100, y: 0 }, 8, section)
    const frame: Frame = { nodes: beam.nodes, elements: beam.elements, supports: [{ node: 0, dofs: [0, 1, 2] }] }
    let observed: unknown
    try {
      followPath(frame, { control: { node: beam.last, dof: 1 }, target: 50, points: 2, tolerance: 1e-17 })
    } catch (e) { observed = e }
    expect(observed).toBeInstanceOf(SolverError)
    expect((observed as Error).message).toMatch(/did not converge at control .*step \d+.*residual/)
  })

  it('refuses a mechanism (singular stiffness) with SolverError', () => {
    const beam = meshStraight({ x: 0, y: 0 }, { x: 100, y: 0 }, 4, section)
    expect(() => followPath({ nodes: beam.nodes, elements: beam.elements, supports: [] }, { control: { node: beam.last, dof: 1 }, target: 1, points: 3 })).toThrow(SolverError)
  })

  it('refuses a frame with a dangling node reference', () => {
    const frame: Frame = { nodes: [{ x: 0, y: 0 }], elements: [{ nodes: [0, 3], section }], supports: [] }
    expect(() => followPath(frame, { control: { node: 0, dof: 1 }, target: 1 })).toThrow(/element 0 refers to node 3/)
  })
})

describe('banded LDLᵀ solve', () => {
  it('solves an indefinite banded system like a dense elimination (checked by the residual)', () => {
    const n = 30, hb = 4
    const m = createBandMatrix(n, hb)
    const dense = Array.from({ length: n }, () => new Float64Array(n))
    let seed = 3
    const rnd = () => { seed = (seed * 16807) % 2147483647; return seed / 2147483647 - 0.5 }
    for (let i = 0; i < n; i++) for (let j = i; j <= Math.min(n - 1, i + hb); j++) {
      const v = i === j ? (i % 7 === 3 ? -5 : 5) + rnd() : rnd()
      bandAdd(m, i, j, v)
      dense[i][j] = v
      dense[j][i] = v
    }
    const b = Float64Array.from({ length: n }, () => rnd())
    const x = Float64Array.from(b)
    expect(bandFactor(m)).toBe(-1)
    expect(m.negativePivots).toBeGreaterThan(0)
    bandSolve(m, x)
    for (let i = 0; i < n; i++) {
      let r = -b[i]
      for (let j = 0; j < n; j++) r += dense[i][j] * x[j]
      expect(Math.abs(r)).toBeLessThan(1e-12)
    }
  })
})
