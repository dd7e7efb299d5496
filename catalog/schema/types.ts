/**
 * The contract every module family fulfils (see DEVELOPERS.md, "Adding a module family").
 * Units: lengths mm, forces N, moduli MPa, energies mJ, angles degrees at this boundary.
 */
import type { Material } from '../materials/types'
import type { BendingBasis, BendingMaterial, WideBeamMode } from '../mechanics/wide-beam'

/** One numeric parameter of a family; the same record drives API validation and the web form. */
export interface ParamSpec {
  key: string
  label: string
  /** Unit shown beside the field ('mm', 'deg', '' for plain numbers). */
  unit: string
  default: number
  min: number
  max: number
  step: number
  help: string
  /** Whole numbers only (counts such as the number of spans). */
  integer?: boolean
  /** Which printer rule applies: 'wall' values are checked against the minimum wall. */
  role?: 'wall' | 'length' | 'angle' | 'count' | 'ratio'
}

/** A rule between fields; `check` returns a message when the rule is broken, otherwise null. */
export interface CrossRule {
  fields: string[]
  check: (params: Record<string, number>) => string | null
}

export type ModuleKind = 'bistable' | 'spring' | 'guide' | 'hinge' | 'latch'

export interface MethodInfo {
  id: string
  label: string
  /** The published source, as it should be cited on a data sheet. */
  source: string
}

export interface MetricSpec {
  key: string
  label: string
  /** '' for dimensionless, 'boolean' for flags. */
  unit: string
  help?: string
}

export interface AxisSpec {
  label: string
  unit: string
}

export interface Curve {
  /** Displacement in mm, or rotation in degrees for hinges (see axes). */
  displacement: number[]
  /** Force in N, or moment in N·mm for hinges (see axes). */
  force: number[]
  /** Largest bending-plus-axial strain in the part at each point (optional per method). */
  strain?: number[]
  axes: { displacement: AxisSpec; force: AxisSpec }
}

export type MetricValue = number | boolean | null

export interface ResolvedMaterial {
  id: string | null
  name: string
  modulus: number
  strainLimit: number
  /** Poisson's ratio; the wide-beam correction reads it (catalog/mechanics/wide-beam.ts). */
  poissonRatio: number
}

export interface Evaluation {
  family: string
  method: string
  params: Record<string, number | string>
  material: ResolvedMaterial
  curve: Curve
  metrics: Record<string, MetricValue>
  warnings: string[]
  /** Plain-language name of the method and its source, for the data sheet. */
  source: string
  /** How the beams' bending modulus was taken (families that bend beams): the wide-beam rule applied. */
  bending?: BendingBasis
}

/** What a family's model receives: validated numbers plus the resolved material. */
export interface ModelInput {
  params: Record<string, number>
  material: ResolvedMaterial
  method: string
  /** 'auto' applies the wide-beam (plate) correction by the beam's proportions, 'off' is plain beam theory. */
  wideBeam: WideBeamMode
}

/** What a family's model returns; the core adds family, params, material and method. */
export interface ModelOutput {
  curve: Curve
  metrics: Record<string, MetricValue>
  warnings: string[]
  /** The wide-beam rule as applied (a family that bends beams states it). */
  bending?: BendingBasis
}

export interface FamilyDefinition {
  id: string
  name: string
  kind: ModuleKind
  summary: string
  params: ParamSpec[]
  rules: CrossRule[]
  methods: MethodInfo[]
  defaultMethod: string
  metrics: MetricSpec[]
  axes: { displacement: AxisSpec; force: AxisSpec }
  /** Pure computation; throws SolverError when the path cannot be followed. */
  evaluate: (input: ModelInput) => ModelOutput
  /** A closed JSCAD geom3 in mm; typed loosely so the schema does not depend on JSCAD. */
  build: (params: Record<string, number>) => unknown
  /** Outer size of the printed part in mm (x along the main axis, y across, z print height). */
  envelope: (params: Record<string, number>) => { x: number; y: number; z: number }
  /** Cautions shown with every result of the family (fatigue, creep). */
  cautions: string[]
  /** True for a family that bends beams: it takes the `wideBeam` parameter ('auto' | 'off'). */
  bendsBeams?: boolean
  /** How search and the design map estimate the family fast; without it, its fast method through evaluate. */
  search?: FamilySearch
  /** How the design map presents the family. */
  designMap?: FamilyDesignMap
  /** The family's own tolerance rules. */
  tolerance?: FamilyTolerance
}

/** The family's fast estimator (closed forms, or a precomputed table) for search and the design map. */
export interface FamilySearch {
  estimator: FastEstimator
}

export interface FamilyDesignMap {
  /**
   * The two parameters engineers sweep first, across (x) and up (y); the map falls back to the
   * first continuous parameter across and the wall thickness up when either is fixed by the entry.
   */
  sweep: [x: string, y: string]
}

export interface FamilyTolerance {
  /**
   * How far the fast estimate may lie from the exact method, per metric, in the metric's own
   * units, for one configuration (its exact metrics and its parameters). A family whose fast
   * estimate is its own closed form leaves this out: the two methods then differ only by the
   * models' own difference, which a confirmation reports as it is.
   */
  estimateAllowance?: (exact: Readonly<Record<string, MetricValue>>, params: Readonly<Record<string, number | string>>) => Record<string, number>
}

// The shape of a family's fast estimator, the cheap method that search and the design map run
// on hundreds of thousands of candidates (a family folder may carry one: FamilySearch).

export type Estimate = Record<string, MetricValue>
/** `bending` carries Poisson's ratio and the wide-beam mode: the estimator takes its modulus through bendingModulus. */
export type EstimateFn = (params: Record<string, number>, modulus: number, strainLimit: number, bending: BendingMaterial) => Estimate
/**
 * Writes the metrics into `out` in the layout's slot order — NaN for an empty (null) metric,
 * 1/0 for a boolean — and returns false where the estimate does not apply (outside a table).
 * Search judges millions of candidates on these raw numbers without building records.
 */
export type FillFn = (params: Record<string, number>, modulus: number, strainLimit: number, out: Float64Array, bending: BendingMaterial) => boolean

/**
 * Metric keys in slot order, and how each depends on the modulus E at fixed geometry: 1 where it
 * is proportional to E (forces, stiffnesses, energies: every closed form here is linear
 * elasticity, and the bistable table is stored divided by E), 0 where it does not depend on E
 * at all (travel, rotation, positions, and the strains: each family's strain is evaluated at a
 * given displacement or rotation, or at a force that is itself proportional to E, so E cancels).
 * That lets search take the modulus tolerance corners from one estimate per wall thickness.
 * `emptyFixed` says whether a metric's being empty (null) is the same at every wall
 * thickness — a snap hook's separation force is empty when its face locks, which only the
 * angles and friction decide — so that a nominal estimate bounds the band (search's screen).
 * A test holds each estimator to all three.
 */
export interface EstimateLayout {
  keys: readonly string[]
  modulusPower: readonly (0 | 1)[]
  booleans: readonly boolean[]
  emptyFixed: readonly boolean[]
}

export interface FastEstimator {
  /** How the estimate is made (reported with every result). */
  method: string
  /** The family method it reproduces: exactly for closed forms, within the table's error for tables. */
  reproduces: string
  /** True when it equals `reproduces` to rounding; false for interpolated tables. */
  exact: boolean
  estimate: EstimateFn
  /** Raw-number form of `estimate` (dedicated estimators; the fallback has none). */
  fill?: FillFn
  layout?: EstimateLayout
  /**
   * Parameters in each of which every metric of the layout is monotone (the others held fixed),
   * booleans and emptiness included: over a box of these parameters every metric lies between
   * its values at the box's corners, and one empty at no corner is empty nowhere inside. Search
   * bounds a whole block of its grid from the corners before estimating any member (block
   * screening). A test samples each estimator to hold it to this.
   */
  monotoneIn?: readonly string[]
  /**
   * With monotoneIn: every metric (and the envelope's area and volume) goes one way with all of
   * those parameters together — it does not rise with one while falling with another — so over
   * a box of them its extremes lie at the box's lowest corner and its highest corner, and a box
   * is bounded from those two instead of all 2ⁿ. A test samples boxes to hold it to this.
   */
  extremesAtEnds?: boolean
}

export type { Material }
export type { BendingBasis, BendingMaterial, WideBeamMode }
