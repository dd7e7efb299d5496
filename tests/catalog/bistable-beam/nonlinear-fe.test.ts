import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog'
import { closedFormMetrics } from '../../../catalog/families/bistable-beam/closed-form'
import { snapMetrics } from '../../../catalog/families/bistable-beam/curve-metrics'
import { CONVERGENCE_ORDER, extrapolateCurves, FE_ELEMENTS, halfBeamFrame, IMPERFECTION, solveBistableCurve, solveBistableFe, type BistableGeometry } from '../../../catalog/families/bistable-beam/fe-model'
import { followPath, meshCurve, rectangleSection, type Frame } from '../../../catalog/solvers'

/** A shallow pair (h/l = 0.02) normalised so that the force scale 2EIh/l³ is returned with it. */
function pair(q: number, eta = 0.02, postLength = 0): { g: BistableGeometry; scale: number } {
  const span = 100, apexHeight = eta * span, thickness = apexHeight / q
  const g = { span, apexHeight, thickness, depth: 1, postLength, modulus: 1000 }
  return { g, scale: (2 * 1000 * (thickness ** 3 / 12) * apexHeight) / span ** 3 }
}

function metricsOf(g: BistableGeometry, elements = FE_ELEMENTS, imperfection?: number) {
  const c = solveBistableFe(g, elements, undefined, imperfection)
  return { m: snapMetrics(c.displacement, c.force), path: c.path }
}

/** The curve the family returns: Richardson extrapolation from FE_ELEMENTS and half as many. */
function defaultMetricsOf(g: BistableGeometry) {
  const c = solveBistableCurve(g)
  return snapMetrics(c.displacement, c.force)
}

/** Benchmark cases where the valley is a small difference of large terms (scripts/bench/bistable.ts). */
const NEAR_CRITICAL: BistableGeometry = { span: 50, apexHeight: 2, thickness: 0.8, depth: 5, postLength: 0, modulus: 2000 }
const SIDE_POSTS: BistableGeometry = { span: 60, apexHeight: 4.8, thickness: 0.8, depth: 5, postLength: 3, modulus: 2000 }

describe('bistable-beam nonlinear FE', () => {
  it('bifurcation: the perfect symmetric path overestimates the peak by a wide margin and is unstable; the seeded path is stable (Qiu, Lang & Slocum, J. MEMS 13(2), 2004)', () => {
    const { g, scale } = pair(6, 0.075)
    const perfect = metricsOf(g, FE_ELEMENTS, 0)
    const physical = metricsOf(g)
    expect(perfect.m.peakForce / physical.m.peakForce).toBeGreaterThan(1.2)
    expect(perfect.path.stable.some((s) => !s)).toBe(true)
    expect(physical.path.stable.every(Boolean)).toBe(true)
    // the physical peak is near the published large-Q value 740 EIh/l³ per beam (from memory), far below 2108
    expect(physical.m.peakForce / scale).toBeGreaterThan(650)
    expect(physical.m.peakForce / scale).toBeLessThan(760)
  })

  it('the seeded imperfection is small enough not to move the peak (10× smaller changes it by < 0.1 %)', () => {
    const { g } = pair(6, 0.05)
    const a = metricsOf(g).m.peakForce, b = metricsOf(g, FE_ELEMENTS, 1e-6).m.peakForce
    expect(Math.abs(a / b - 1)).toBeLessThan(1e-3)
  })

  for (const q of [3, 4, 6, 10]) {
    it(`Q = ${q}, rigid ends: the two-mode closed form overstates the peak by a few percent and places it early (Qiu et al. 2004)`, () => {
      // tolerance: the two-mode model neglects modes 5, 7, … which soften the path; the
      // converged solution is 3 % below it for shallow arches, so 1–6 % below is required
      const { g, scale } = pair(q)
      const observed = metricsOf(g, 40).m
      const expected = closedFormMetrics(q)
      const ratio = observed.peakForce / scale / expected.peak
      expect(ratio).toBeGreaterThan(0.94)
      expect(ratio).toBeLessThan(0.99)
      expect(observed.peakAt / g.apexHeight).toBeGreaterThan(expected.peakAt)
      expect(Math.abs(observed.valleyForce / scale / expected.valley - 1)).toBeLessThan(0.04)
      // the zeros of the curve are fixed by the mode-3 line and the mode-1 curve: within 0.5 % of h
      expect(Math.abs(observed.unstableAt / g.apexHeight - 4 / 3)).toBeLessThan(5e-3)
      expect(Math.abs(observed.secondAt / g.apexHeight - expected.secondAt!)).toBeLessThan(5e-3)
    })
  }

  it('mesh convergence: metrics converge with refinement and the default mesh is within 1 % of the converged values', () => {
    for (const { g } of [pair(3, 0.05), pair(6, 0.075), pair(10, 0.1, 1)]) {
      const meshes = [5, 10, 20, 40, 160].map((n) => metricsOf(g, n).m)
      const converged = meshes[4]
      const errors = meshes.slice(0, 4).map((m) => Math.max(Math.abs(m.peakForce - converged.peakForce), Math.abs(m.valleyForce - converged.valleyForce)) / converged.peakForce)
      for (let i = 1; i < errors.length; i++) expect(errors[i]).toBeLessThan(errors[i - 1])
      const atDefault = metricsOf(g).m
      expect(Math.abs(atDefault.peakForce / converged.peakForce - 1)).toBeLessThan(0.01)
      expect(Math.abs(atDefault.valleyForce - converged.valleyForce) / Math.abs(converged.valleyForce)).toBeLessThan(0.01)
      const extrapolated = defaultMetricsOf(g)
      expect(Math.abs(extrapolated.peakForce / converged.peakForce - 1)).toBeLessThan(0.01)
      expect(Math.abs(extrapolated.valleyForce - converged.valleyForce) / Math.abs(converged.valleyForce)).toBeLessThan(0.01)
    }
    // near the bistability limit and with side posts the valley is small beside the peak, and a
    // single 20-element mesh misses it by 2–3 % of itself; the family's curve (Richardson from
    // 20 and 10 elements) is within 1 %, and at least four times closer than the single mesh
    for (const g of [NEAR_CRITICAL, SIDE_POSTS]) {
      const meshes = [5, 10, 20, 40, 160].map((n) => metricsOf(g, n).m)
      const converged = meshes[4]
      const valleyErrors = meshes.slice(0, 4).map((m) => Math.abs(m.valleyForce / converged.valleyForce - 1))
      for (let i = 1; i < valleyErrors.length; i++) expect(valleyErrors[i]).toBeLessThan(valleyErrors[i - 1])
      const observed = defaultMetricsOf(g)
      const valleyError = Math.abs(observed.valleyForce / converged.valleyForce - 1)
      expect(Math.abs(observed.peakForce / converged.peakForce - 1)).toBeLessThan(0.01)
      expect(valleyError).toBeLessThan(0.01)
      expect(valleyError).toBeLessThan(valleyErrors[2] / 4)
    }
  })

  it(`the mesh error falls as h^${CONVERGENCE_ORDER}, the order the Richardson extrapolation assumes (observed order log₂ of successive differences, Richardson 1911)`, () => {
    for (const g of [pair(6, 0.075).g, NEAR_CRITICAL, SIDE_POSTS]) {
      const [a, b, c] = [10, 20, 40].map((n) => metricsOf(g, n).m)
      const order = (x: number, y: number, z: number) => Math.log2((x - y) / (y - z))
      expect(Math.abs(order(a.peakForce, b.peakForce, c.peakForce) - CONVERGENCE_ORDER)).toBeLessThan(0.1)
      expect(Math.abs(order(a.valleyForce, b.valleyForce, c.valleyForce) - CONVERGENCE_ORDER)).toBeLessThan(0.1)
    }
  })

  it('the extrapolated curve runs from 0 to 2·apexHeight with rising displacement, and its extrema are the extrapolated extrema of the two meshes (Richardson 1911)', () => {
    const g = NEAR_CRITICAL
    const curve = solveBistableCurve(g)
    expect(curve.displacement[0]).toBe(0)
    expect(curve.force[0]).toBe(0)
    expect(curve.displacement.at(-1)).toBe(2 * g.apexHeight)
    for (let i = 1; i < curve.displacement.length; i++) expect(curve.displacement[i]).toBeGreaterThan(curve.displacement[i - 1])
    expect(curve.displacement.length).toBeGreaterThanOrEqual(101)
    const fine = metricsOf(g, FE_ELEMENTS).m, coarse = metricsOf(g, FE_ELEMENTS / 2).m
    const expected = (f: number, c: number) => f + (f - c) / (2 ** CONVERGENCE_ORDER - 1)
    const observed = snapMetrics(curve.displacement, curve.force)
    expect(observed.peakForce).toBeCloseTo(expected(fine.peakForce, coarse.peakForce), 9)
    expect(observed.valleyForce).toBeCloseTo(expected(fine.valleyForce, coarse.valleyForce), 9)
    expect(observed.valleyAt).toBeCloseTo(expected(fine.valleyAt, coarse.valleyAt), 9)
  })

  it('no extrapolation between curves that disagree on the extrema (a shallow arch whose force only rises)', () => {
    const bistable = solveBistableFe(NEAR_CRITICAL, FE_ELEMENTS)
    const monostable = solveBistableFe({ ...NEAR_CRITICAL, apexHeight: 0.4 }, FE_ELEMENTS / 2)
    expect(monostable.path.extrema.length).not.toBe(bistable.path.extrema.length)
    expect(extrapolateCurves(bistable, monostable)).toBeNull()
  })

  it('the half-beam model equals the whole module: two full beams joined by a rigid shuttle that cannot rotate but may slide (symmetry; mode 2 suppressed)', () => {
    const { g } = pair(5, 0.05)
    const section = rectangleSection(g.modulus, g.thickness, g.depth)
    const gap = 10
    const beam = (y0: number, offset: number) => meshCurve((s) => ({ x: s * g.span, y: y0 + (g.apexHeight / 2) * (1 - Math.cos(2 * Math.PI * s)) }), 2 * FE_ELEMENTS, section, offset)
    const lower = beam(0, 0)
    const upper = beam(gap, lower.nodes.length)
    const midLower = FE_ELEMENTS, midUpper = lower.nodes.length + FE_ELEMENTS
    const frame: Frame = {
      nodes: [...lower.nodes, ...upper.nodes], elements: [...lower.elements, ...upper.elements],
      supports: [
        ...[lower.first, lower.last, upper.first, upper.last].map((node) => ({ node, dofs: [0, 1, 2] as Array<0 | 1 | 2> })),
        // the shuttle is guided against rotation; sideways it is free
        { node: midLower, dofs: [2] },
      ],
      rigidLinks: [{ master: midLower, slave: midUpper }],
    }
    // second symmetric shape plus a smaller antisymmetric one, so any lower asymmetric path would show
    const imperfection = frame.nodes.map((p, node) => ({
      node, dx: 0, dy: g.thickness * (1e-5 * (1 - Math.cos((4 * Math.PI * p.x) / g.span)) + 1e-6 * Math.sin((2 * Math.PI * p.x) / g.span) * Math.sin((Math.PI * p.x) / g.span)),
    }))
    const module = followPath(frame, { control: { node: midLower, dof: 1 }, target: -2 * g.apexHeight, imperfection })
    const whole = snapMetrics(module.control.map((c) => -c), module.reaction.map((r) => -r))
    const half = metricsOf(g).m
    expect(Math.abs(whole.peakForce / half.peakForce - 1)).toBeLessThan(1e-3)
    expect(Math.abs(whole.valleyForce / half.valleyForce - 1)).toBeLessThan(1e-3)
  })

  it('a side post adds the post as a frame member of the given length', () => {
    const { g } = pair(6, 0.05, 5)
    const { frame } = halfBeamFrame(g, 20)
    expect(frame.nodes[0]).toEqual({ x: 0, y: -5 })
  })
})

describe('bistable-beam side posts (common practice; see docs/references.md §1)', () => {
  const span = 60, thickness = 0.8
  const run = (apexHeight: number, postLength: number) => metricsOf({ span, apexHeight, thickness, depth: 5, postLength, modulus: 2000 }).m

  it('longer side posts lower the peak force and raise the valley force (common practice)', () => {
    const m = [0, 1, 2, 4].map((post) => run(4, post))
    for (let i = 1; i < m.length; i++) {
      expect(m[i].peakForce).toBeLessThan(m[i - 1].peakForce)
      expect(m[i].valleyForce).toBeGreaterThan(m[i - 1].valleyForce)
    }
  })

  it('longer side posts raise the apexHeight/thickness ratio needed for bistability (common practice)', () => {
    const criticalQ = (post: number) => {
      for (let q = 1.5; q <= 15; q += 0.05) if (run(q * thickness, post).valleyForce < 0) return q
      return Infinity
    }
    const observed = [0, 1, 2, 3].map(criticalQ)
    // rigid ends: near Qiu et al.'s √(16/3) = 2.31
    expect(observed[0]).toBeGreaterThan(2.2)
    expect(observed[0]).toBeLessThan(2.6)
    for (let i = 1; i < observed.length; i++) expect(observed[i]).toBeGreaterThan(observed[i - 1])
  })

  it('the work absorbed changes much less than the peak force: about half as much (common practice)', () => {
    for (const apexHeight of [4, 5, 6]) {
      const rigid = run(apexHeight, 0)
      for (const post of [0.5, 1, 2, 3]) {
        const posted = run(apexHeight, post)
        expect(posted.valleyForce).toBeLessThan(0)
        const peakChange = Math.abs(posted.peakForce / rigid.peakForce - 1)
        const workChange = Math.abs(posted.energyIn / rigid.energyIn - 1)
        expect(peakChange).toBeGreaterThan(0.05)
        expect(workChange).toBeLessThan(0.6 * peakChange)
      }
    }
  })
})

describe('second snap: the path folds back with short side posts (limit point in displacement)', () => {
  // apex height 5 × the thickness, span 83 × the thickness, posts about 1.0–1.1 mm on a 0.6 mm
  // beam: followed by the arc-length method (Crisfield 1981), the path turns back in
  // displacement near 1.82 × the apex height; under displacement control the shuttle jumps there
  const t = 0.6
  const base = { span: 83 * t, apexHeight: 5 * t, thickness: t, depth: 5, modulus: 2000 }

  it('the arc-length path turns back in displacement where the displacement-controlled path reports its jump', () => {
    const g = { ...base, postLength: 1.05 }
    const { frame, mid, beamNodes } = halfBeamFrame(g, FE_ELEMENTS)
    const imperfection = beamNodes.map((node) => ({ node, dx: 0, dy: IMPERFECTION * g.thickness * (1 - Math.cos((4 * Math.PI * frame.nodes[node].x) / g.span)) }))
    const arc = followPath(frame, { control: { node: mid, dof: 1 }, target: -2 * g.apexHeight, points: 201, imperfection, strategy: 'arc-length' })
    const x = arc.control.map((c) => -c)
    let turn = -1
    for (let i = 1; i + 1 < x.length; i++) if (x[i] > x[i - 1] && x[i + 1] < x[i] && x[i] > g.apexHeight) { turn = i; break }
    expect(turn, 'the arc-length path folds back').toBeGreaterThan(0)
    const fe = solveBistableFe(g)
    expect(fe.folds.length).toBeGreaterThan(0)
    // the fold of the arc-length path is between its steps: within one of them
    const stepAt = Math.max(x[turn] - x[turn - 1], x[turn] - x[turn + 1])
    expect(Math.abs(fe.folds[0] - x[turn])).toBeLessThanOrEqual(stepAt + 0.01 * g.apexHeight)
  })

  it('reports secondSnapPosition with a warning, and the valley on the physical path whatever the sampling', () => {
    const at = (points: number) => {
      const fe = solveBistableFe({ ...base, postLength: 1.05 }, FE_ELEMENTS, points)
      return snapMetrics(fe.displacement, fe.force)
    }
    const a = at(101), b = at(67), c = at(151)
    // the valley is the fold itself, located to the solver's tolerance: 101, 67 or 151 points agree
    expect(Math.abs(a.valleyForce - b.valleyForce) / a.peakForce).toBeLessThan(1e-3)
    expect(Math.abs(a.valleyForce - c.valleyForce) / a.peakForce).toBeLessThan(1e-3)
    const out = evaluate('bistable-beam', { ...base, postLength: 1.05 })
    const second = out.metrics.secondSnapPosition as number
    expect(second / base.apexHeight).toBeGreaterThan(1.7)
    expect(second / base.apexHeight).toBeLessThan(1.95)
    expect(out.warnings.join(' ')).toMatch(/Second snap: the force–displacement path folds back at/)
    // the jump is on the curve: two points a sliver apart in displacement, the force rising between them
    const i = out.curve.displacement.findIndex((d) => Math.abs(d - second) < 1e-9)
    expect(i).toBeGreaterThan(0)
    expect(out.curve.displacement[i + 1] - out.curve.displacement[i]).toBeLessThan(1e-3 * base.apexHeight)
    expect(out.curve.force[i + 1]).toBeGreaterThan(out.curve.force[i])
    // rigid ends on the same arch do not fold
    expect(evaluate('bistable-beam', { ...base, postLength: 0 }).metrics.secondSnapPosition).toBeNull()
  })
})
