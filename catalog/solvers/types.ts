/**
 * The planar frame solver's contract. Units: mm, N, MPa; rotations in radians.
 * Degrees of freedom per node: 0 = ux, 1 = uy, 2 = rotation (counter-clockwise).
 */
export type Dof = 0 | 1 | 2

export interface Section {
  /** Young's modulus E, MPa. */
  modulus: number
  /** Cross-section area, mm². */
  area: number
  /** Second moment of area about the out-of-plane axis, mm⁴. */
  inertia: number
  /** Distance from the neutral axis to the outer fibre (t/2), mm: turns curvature into strain. */
  fibre: number
}

export interface FrameElement {
  nodes: [number, number]
  section: Section
}

export interface Frame {
  nodes: Array<{ x: number; y: number }>
  elements: FrameElement[]
  /** Degrees of freedom held at zero. */
  supports: Array<{ node: number; dofs: Dof[] }>
  /** Linear springs to ground (a compliant anchor), N/mm or N·mm/rad. */
  springs?: Array<{ node: number; dof: Dof; stiffness: number }>
  /** Rigid connections: the slave node follows the master as if welded to it (shuttles, links). */
  rigidLinks?: Array<{ master: number; slave: number }>
}

export interface PathRequest {
  /** The degree of freedom that is driven; its reaction is the returned force (or moment). */
  control: { node: number; dof: Dof }
  /** Final prescribed value of the control degree of freedom (mm, or rad for a rotation). */
  target: number
  /** Least number of points returned along the path, evenly spread in the control value. */
  points?: number
  /** 'displacement' steps the control value; 'arc-length' follows limit points and snap-back. */
  strategy?: 'displacement' | 'arc-length'
  /** Other degrees of freedom whose values are reported at each point (drift, parasitic motion). */
  track?: Array<{ node: number; dof: Dof }>
  /** Small initial deviation of node positions (mm) that selects the physical branch at a bifurcation. */
  imperfection?: Array<{ node: number; dx: number; dy: number }>
  /** Newton tolerance on the residual, relative to the reaction scale. */
  tolerance?: number
  maxIterations?: number
  /**
   * Locate each local maximum and minimum of the reaction between steps (regula falsi on the
   * path slope) and insert it as an extra point; default true under displacement control.
   */
  extrema?: boolean
}

/** A local extremum of the reaction along the path, located to the solver's tolerance. */
interface PathExtremum {
  kind: 'max' | 'min'
  control: number
  reaction: number
  maxStrain: number
  /** Index of this point in the PathResult arrays. */
  index: number
}

export interface PathResult {
  /** Prescribed control value at each point. */
  control: number[]
  /** Reaction at the control degree of freedom at each point (N, or N·mm for a rotation). */
  reaction: number[]
  /** Largest |axial strain| + |bending strain| over all elements at each point. */
  maxStrain: number[]
  /** Values of the tracked degrees of freedom, one array per entry of `track`. */
  tracked: number[][]
  /** Total Newton iterations, for benchmarks. */
  iterations: number
  /** Whether the equilibrium is stable under the chosen control (no negative pivot in the tangent). */
  stable: boolean[]
  /** Local extrema of the reaction (also present as points in the arrays above). */
  extrema: PathExtremum[]
  /** Accepted path steps, for benchmarks. */
  steps: number
  /**
   * Control values where the path folded back under displacement control and the solver
   * continued on the stable branch the part snaps to (a jump in the curve, as on a test stand).
   */
  jumps: number[]
  /**
   * Where the path lost stability under displacement control (located to 10⁻⁴ of a station
   * spacing): a bifurcation or limit point, e.g. the buckling load of a perfect column.
   */
  stabilityLoss: Array<{ control: number; reaction: number }>
}
