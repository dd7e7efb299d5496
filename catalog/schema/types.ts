/**
 * The contract every module family fulfils (see DEVELOPERS.md, "Adding a module family").
 * Units: lengths mm, forces N, moduli MPa, energies mJ, angles degrees at this boundary.
 */
import type { Material } from '../materials/types'

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
}

/** What a family's model receives: validated numbers plus the resolved material. */
export interface ModelInput {
  params: Record<string, number>
  material: ResolvedMaterial
  method: string
}

/** What a family's model returns; the core adds family, params, material and method. */
export interface ModelOutput {
  curve: Curve
  metrics: Record<string, MetricValue>
  warnings: string[]
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
}

export type { Material }
