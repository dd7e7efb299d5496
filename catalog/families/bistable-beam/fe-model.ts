/**
 * The bistable pair as a frame for the solver. Half of one beam is modelled: the shuttle
 * holds mid-span rotation and, for the symmetric shapes that carry the snap (modes 1 and 3
 * of Qiu, Lang & Slocum 2004), mid-span does not move sideways, so the cut at mid-span is
 * guided (ux = 0, θ = 0) and pushed in y. Rotation at mid-span is held by the shuttle, so the
 * antisymmetric mode 2 cannot appear; both beams deform alike, so the module carries
 * 2 beams × 2 half-beams = 4 times the half-beam reaction.
 */
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

/** Elements along the half beam: peak and valley within 1 % of the mesh-converged values (tests). */
export const FE_ELEMENTS = 20
/** Points of the returned curve, evenly spread over 0 … 2·apexHeight. */
export const FE_POINTS = 101
/**
 * Amplitude of the seeded second-symmetric-shape imperfection, as a fraction of the thickness.
 * It only selects the physical branch at the bifurcation (REFERENCES.md §1); at this size it
 * lowers the peak by well under 0.1 % (checked in the tests).
 */
export const IMPERFECTION = 1e-5

/** Bumped when the bistable frame model (mesh, imperfection, points) changes its numbers. */
export const BISTABLE_MODEL_VERSION = 1

export interface FeCurve {
  /** Shuttle displacement, mm (0 … 2·apexHeight). */
  displacement: number[]
  /** Force on the shuttle for the module (both beams), N; positive pushes. */
  force: number[]
  strain: number[]
  path: PathResult
}

/** Elements along a side post for a half beam of `elements` elements (same density, at least 1 per 8). */
export function postElements(g: BistableGeometry, elements: number): number {
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

/** Follows the module's force–displacement path from 0 to 2·apexHeight. */
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
    path,
  }
}
