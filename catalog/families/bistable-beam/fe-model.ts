/**
 * The bistable pair as a frame for the solver. Half of one beam is modelled: the shuttle
 * holds mid-span rotation and, for the symmetric shapes that carry the snap (modes 1 and 3
 * of Qiu, Lang & Slocum 2004), mid-span does not move sideways, so the cut at mid-span is
 * guided (ux = 0, θ = 0) and pushed in y. Rotation at mid-span is held by the shuttle, so the
 * antisymmetric mode 2 cannot appear; both beams deform alike, so the module carries
 * 2 beams × 2 half-beams = 4 times the half-beam reaction.
 */
import { SolverError } from '../../errors'
import { followPath, meshCurve, meshStraight, rectangleSection, type Frame, type PathResult } from '../../solvers'

export interface BistableGeometry {
  span: number
  apexHeight: number
  thickness: number
  depth: number
  postLength: number
  /** Young's modulus, MPa. */
  modulus: number
}

/**
 * Elements along the half beam (the fine mesh of solveBistableCurve, whose coarse mesh has half
 * as many): extrapolated peak and valley within 0.1 % of the mesh-converged values, the single
 * mesh within 1 % away from the bistability limit (tests).
 */
export const FE_ELEMENTS = 20
/** Points of the returned curve, evenly spread over 0 … 2·apexHeight. */
export const FE_POINTS = 101
/**
 * Amplitude of the seeded second-symmetric-shape imperfection, as a fraction of the thickness.
 * It only selects the physical branch at the bifurcation (docs/references.md §1); at this size it
 * lowers the peak by well under 0.1 % (checked in the tests).
 */
export const IMPERFECTION = 1e-5

/** Bumped when the bistable frame model (mesh, imperfection, points) changes its numbers. */
export const BISTABLE_MODEL_VERSION = 3

export interface FeCurve {
  /** Shuttle displacement, mm (0 … 2·apexHeight). */
  displacement: number[]
  /** Force on the shuttle for the module (both beams), N; positive pushes. */
  force: number[]
  strain: number[]
  /**
   * Shuttle displacements (mm) where the path folds back under displacement control: the
   * shuttle jumps there to the branch the curve continues on (a second snap). The curve holds
   * the last point before the jump and the first after it, a sliver of a step apart.
   */
  folds: number[]
  /** The solver's path (of the fine mesh, for an extrapolated curve). */
  path: PathResult
}

/** Elements along a side post for a half beam of `elements` elements (same density, at least 1 per 8). */
function postElements(g: BistableGeometry, elements: number): number {
  if (g.postLength <= 0) return 0
  const perEight = Math.min(8, Math.max(1, Math.ceil((8 * g.postLength) / (g.span / 2))))
  return Math.max(1, Math.round((perEight * elements) / 8))
}

/** The half-beam frame: clamp (or post foot) first, mid-span node last. */
export function halfBeamFrame(g: BistableGeometry, elements: number): { frame: Frame; mid: number; beamNodes: number[] } {
  const section = rectangleSection(g.modulus, g.thickness, g.depth)
  const half = g.span / 2
  const beam = (s: number) => ({ x: s * half, y: (g.apexHeight / 2) * (1 - Math.cos(Math.PI * s)) })
  const posts = postElements(g, elements)
  if (posts === 0) {
    const part = meshCurve(beam, elements, section)
    return {
      frame: { nodes: part.nodes, elements: part.elements, supports: [{ node: 0, dofs: [0, 1, 2] }, { node: part.last, dofs: [0, 2] }] },
      mid: part.last,
      beamNodes: part.nodes.map((_, i) => i),
    }
  }
  // the post rises from its foot on the frame to the beam end at (0, 0); the beam continues from there
  const post = meshStraight({ x: 0, y: -g.postLength }, { x: 0, y: 0 }, posts, section)
  const arch = meshCurve(beam, elements, section, post.last)
  const nodes = [...post.nodes, ...arch.nodes.slice(1)]
  return {
    frame: { nodes, elements: [...post.elements, ...arch.elements], supports: [{ node: 0, dofs: [0, 1, 2] }, { node: arch.last, dofs: [0, 2] }] },
    mid: arch.last,
    beamNodes: Array.from({ length: elements + 1 }, (_, i) => post.last + i),
  }
}

/** Follows the module's force–displacement path from 0 to 2·apexHeight on one mesh of `elements` half-beam elements. */
export function solveBistableFe(g: BistableGeometry, elements = FE_ELEMENTS, points = FE_POINTS, imperfectionAmplitude = IMPERFECTION): FeCurve {
  const { frame, mid, beamNodes } = halfBeamFrame(g, elements)
  // second symmetric shape 1 − cos(4πx/l): zero at the clamp and at mid-span
  const imperfection = beamNodes.map((node) => ({
    node, dx: 0, dy: imperfectionAmplitude * g.thickness * (1 - Math.cos((4 * Math.PI * frame.nodes[node].x) / g.span)),
  }))
  const path = followPath(frame, { control: { node: mid, dof: 1 }, target: -2 * g.apexHeight, points, imperfection })
  return {
    // + 0 turns −0 into 0
    displacement: path.control.map((c) => -c + 0),
    force: path.reaction.map((r) => -4 * r + 0),
    strain: path.maxStrain,
    folds: path.jumps.map((c) => -c + 0),
    path,
  }
}

/**
 * Order of the discretisation error of the curve in the element length h: forces, positions
 * and strains converge as h² (measured in tests/catalog/bistable-beam: the observed order is
 * 2.00 ± 0.05 for the peak and valley over n = 10 … 320).
 */
export const CONVERGENCE_ORDER = 2

/**
 * Value at x of the curve through (xs[i], ys[i]), i = from … to (x increasing), by the cubic
 * through the four nodes nearest x inside that range (fewer when the range has fewer).
 */
function interpolatePiece(xs: number[], ys: number[], from: number, to: number, x: number): number {
  const count = to - from + 1
  if (count === 1) return ys[from]
  let lo = from
  while (lo < to - 1 && xs[lo + 1] <= x) lo++
  const m = Math.min(4, count)
  let a = Math.max(from, lo - (m >> 1) + 1)
  if (a + m - 1 > to) a = to - m + 1
  let value = 0
  for (let i = a; i < a + m; i++) {
    let w = 1
    for (let j = a; j < a + m; j++) if (j !== i) w *= (x - xs[j]) / (xs[i] - xs[j])
    value += w * ys[i]
  }
  return value
}

/**
 * The module's curve with the mesh error removed to leading order by Richardson's deferred
 * approach to the limit (Richardson, Phil. Trans. R. Soc. A 210:307–357, 1911): a fine mesh of
 * `elements` and a coarse one of half as many give v ≈ v_fine + (v_fine − v_coarse)/(2^p − 1),
 * p = CONVERGENCE_ORDER. The peak and the valley are sharp corners of the path (where it leaves
 * and rejoins the symmetric shape), and each mesh puts them O(h²) apart; a difference taken at
 * equal displacement near a corner would compare the two sides of it. So the curves are
 * compared at equal fraction s of the way between consecutive extrema (and the two ends), and
 * displacement, force and strain are all extrapolated at equal s: at the extrema this is the
 * extrapolation of the extremum itself. Where the two meshes disagree on the extrema, either
 * path jumps (a snap under displacement control) or the coarse path is lost, there is no such
 * expansion, and the fine curve is returned as it is (about 1 % of the table's nodes, near
 * the bistability limit and for very slender or deep arches).
 */
export function solveBistableCurve(g: BistableGeometry, elements = FE_ELEMENTS, points = FE_POINTS, imperfectionAmplitude = IMPERFECTION): FeCurve {
  if (!(Number.isInteger(elements / 2) && elements >= 4)) throw new RangeError('solveBistableCurve: elements must be an even number of at least 4')
  const fine = solveBistableFe(g, elements, points, imperfectionAmplitude)
  let coarse: FeCurve
  try {
    // the same stations: with fewer, a sharp peak can fall inside one step and go unlocated
    coarse = solveBistableFe(g, elements / 2, points, imperfectionAmplitude)
  } catch (error) {
    // a path the fine mesh follows is not lost because the coarse one cannot
    if (error instanceof SolverError) return fine
    throw error
  }
  return extrapolateCurves(fine, coarse) ?? fine
}

/**
 * The extrapolation of solveBistableCurve from a fine curve and one on a mesh of half as many
 * elements; null where it does not apply (different extrema, a jump in either path).
 */
export function extrapolateCurves(fine: FeCurve, coarse: FeCurve): FeCurve | null {
  const ef = fine.path.extrema, ec = coarse.path.extrema
  if (fine.path.jumps.length > 0 || coarse.path.jumps.length > 0) return null
  if (ef.length !== ec.length || ef.some((e, i) => e.kind !== ec[i].kind)) return null
  const factor = 1 / (2 ** CONVERGENCE_ORDER - 1)
  const xf = fine.displacement, xc = coarse.displacement
  // knots: the two ends and the extrema, as indices into each curve
  const knotsFine = [0, ...ef.map((e) => e.index), xf.length - 1]
  const knotsCoarse = [0, ...ec.map((e) => e.index), xc.length - 1]
  for (let p = 0; p + 1 < knotsFine.length; p++) {
    const at = (i: number) => xf[knotsFine[i]] + factor * (xf[knotsFine[i]] - xc[knotsCoarse[i]])
    if (!(at(p + 1) > at(p))) return null
  }
  const displacement: number[] = [], force: number[] = [], strain: number[] = []
  for (let p = 0; p + 1 < knotsFine.length; p++) {
    const a = knotsFine[p], b = knotsFine[p + 1], ca = knotsCoarse[p], cb = knotsCoarse[p + 1]
    for (let k = p === 0 ? a : a + 1; k <= b; k++) {
      // the same fraction of the way between the knots on the coarse curve; knots are taken as they are
      const atKnot = k === a ? ca : k === b ? cb : -1
      const x = atKnot >= 0 ? xc[atKnot] : xc[ca] + ((xf[k] - xf[a]) / (xf[b] - xf[a])) * (xc[cb] - xc[ca])
      const fc = atKnot >= 0 ? coarse.force[atKnot] : interpolatePiece(xc, coarse.force, ca, cb, x)
      const sc = atKnot >= 0 ? coarse.strain[atKnot] : interpolatePiece(xc, coarse.strain, ca, cb, x)
      // + 0 turns −0 into 0
      displacement.push(xf[k] + factor * (xf[k] - x) + 0)
      force.push(fine.force[k] + factor * (fine.force[k] - fc) + 0)
      strain.push(fine.strain[k] + factor * (fine.strain[k] - sc))
    }
  }
  return { displacement, force, strain, folds: [], path: fine.path }
}
