/**
 * Parallel-blade guide: two fixed-guided blades carrying a rigid stage, pushed across the blades.
 * Small travel: Roark's Formulas for Stress and Strain (Young & Budynas, 7th ed., 2002),
 * fixed-guided beam k = 12EI/L³, two in parallel; parasitic shortening u = (3/5)δ²/L from the
 * beam constraint model of Awtar, Slocum & Sevincer, J. Mechanical Design 129:625–639, 2007.
 */
import { bendingBasis } from '../../mechanics/wide-beam'
import type { AxisSpec, MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'
import { nonlinearFeMethod, peakStrainMetric, strainSafetyMetric } from '../../schema/define'
import { followPath, indicesUpTo, meshStraight, rectangleSection, sampleAt, strainLimitedStop, type Frame, type PathResult } from '../../solvers'

export const CURVE_POINTS = 41
/** The curve runs this far past the strain-limit travel, so the limit sits inside the plot. */
export const CURVE_EXTENT = 1.2
/** Travel beyond this fraction of the blade length is outside the guide's working range (capped). */
export const TRAVEL_CAP_RATIO = 0.4
/** The beam constraint model is stated for transverse travel up to about a tenth of the length (Awtar et al. 2007). */
const LINEAR_RANGE_RATIO = 0.1
/** Beam elements per blade; force and shortening are within 0.1 % of a 48-element mesh (tests). */
export const BLADE_ELEMENTS = 12
const FE_POINTS = 61

export const methods: MethodInfo[] = [
  {
    id: 'linear',
    label: 'Linear beam theory',
    source: 'Roark\u2019s Formulas for Stress and Strain (Young & Budynas, 7th ed., 2002): fixed-guided beam 12EI/L³, two blades in parallel; parasitic shortening (3/5)δ²/L per Awtar, Slocum & Sevincer, J. Mechanical Design 129:625–639, 2007',
  },
  nonlinearFeMethod('Geometrically exact planar beam elements (corotational formulation) followed along the equilibrium path under displacement control; both blades meshed, the stage rigid'),
]

export const metrics: MetricSpec[] = [
  { key: 'stiffness', label: 'Stiffness', unit: 'N/mm', help: 'Force per mm of stage travel for small travel.' },
  { key: 'maxTravel', label: 'Largest travel', unit: 'mm', help: 'Stage travel at which the blades reach the strain limit (or the end of the working range).' },
  { key: 'parasiticMotion', label: 'Parasitic motion', unit: 'mm', help: 'How far the stage is pulled towards the base (blade shortening) at the largest travel.' },
  peakStrainMetric('Largest strain in the blades at the largest travel (a fraction).'),
  strainSafetyMetric('travel'),
]

export const axes: { displacement: AxisSpec; force: AxisSpec } = {
  displacement: { label: 'Stage travel', unit: 'mm' },
  force: { label: 'Force', unit: 'N' },
}

/** Second moment of area of one blade, b t³/12 (mm⁴). */
export function bladeInertia(params: Record<string, number>): number {
  return (params.depth * params.thickness ** 3) / 12
}

/** Two fixed-guided blades in parallel: k = 2 × 12EI/L³ (Roark 7th ed.). */
export function linearStiffness(params: Record<string, number>, modulus: number): number {
  return (24 * modulus * bladeInertia(params)) / params.length ** 3
}

/**
 * Peak strain of the blades at travel δ: bending of a fixed-guided blade, M = 6EIδ/L² at both
 * ends, ε = 3tδ/L² (Roark 7th ed.), plus the axial strain of the couple that holds the stage
 * level. The blades' end moments, F·L/2 together, are balanced on the rigid stage by equal and
 * opposite axial forces N = F·L/(2·spacing) (statics of the stage); with F = 24EIδ/L³ that is
 * N/(EA) = t²δ/(L²·spacing), a fraction t/(3·spacing) of the bending strain.
 */
export function linearStrain(params: Record<string, number>, travel: number): number {
  const t = params.thickness, L = params.length
  return (3 * t * travel) / L ** 2 + (t * t * travel) / (L * L * params.spacing)
}

/** Parasitic shortening of a fixed-guided blade, u = (3/5)δ²/L (Awtar et al. 2007, no axial load). */
export function parasiticShortening(length: number, travel: number): number {
  return (0.6 * travel * travel) / length
}

export interface TravelRange {
  maxTravel: number
  strainGoverned: boolean
}

/** Travel at the strain limit, capped at the working range. */
export function linearTravelRange(params: Record<string, number>, strainLimit: number): TravelRange {
  // linearStrain is proportional to the travel
  const atLimit = strainLimit / linearStrain(params, 1)
  const cap = TRAVEL_CAP_RATIO * params.length
  return atLimit <= cap ? { maxTravel: atLimit, strainGoverned: true } : { maxTravel: cap, strainGoverned: false }
}

export function capWarning(params: Record<string, number>): string {
  return `The strain limit is not reached within ${TRAVEL_CAP_RATIO * 100} % of the blade length (${(TRAVEL_CAP_RATIO * params.length).toPrecision(3)} mm) of travel; the largest travel is capped at the end of the guide's working range.`
}

function linear(params: Record<string, number>, modulus: number, strainLimit: number): ModelOutput {
  const k = linearStiffness(params, modulus)
  const range = linearTravelRange(params, strainLimit)
  const warnings: string[] = []
  if (!range.strainGoverned) warnings.push(capWarning(params))
  if (range.maxTravel > LINEAR_RANGE_RATIO * params.length) {
    warnings.push(`The largest travel is ${Math.round((100 * range.maxTravel) / params.length)} % of the blade length: linear theory and the (3/5)δ²/L shortening hold for travel up to about ${LINEAR_RANGE_RATIO * 100} % (Awtar et al. 2007); use nonlinear-fe for the curve at large travel.`)
  }
  const end = range.maxTravel * (range.strainGoverned ? CURVE_EXTENT : 1)
  const displacement: number[] = []
  const force: number[] = []
  const strain: number[] = []
  for (let i = 0; i < CURVE_POINTS; i++) {
    const d = (end * i) / (CURVE_POINTS - 1)
    displacement.push(d)
    force.push(k * d)
    strain.push(linearStrain(params, d))
  }
  const peakStrain = linearStrain(params, range.maxTravel)
  return {
    curve: { displacement, force, strain, axes },
    metrics: {
      stiffness: k,
      maxTravel: range.maxTravel,
      parasiticMotion: parasiticShortening(params.length, range.maxTravel),
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

/**
 * The guide as a frame: blades along x at y = 0 and y = spacing, clamped at x = 0; the stage is a
 * master node at (L, spacing/2) that both blade tips follow rigidly, driven across the blades.
 */
export function guideFrame(params: Record<string, number>, modulus: number, elements = BLADE_ELEMENTS): { frame: Frame; stage: number } {
  const { length: L, spacing } = params
  const section = rectangleSection(modulus, params.thickness, params.depth)
  const lower = meshStraight({ x: 0, y: 0 }, { x: L, y: 0 }, elements, section)
  const upper = meshStraight({ x: 0, y: spacing }, { x: L, y: spacing }, elements, section, lower.nodes.length)
  const nodes = [...lower.nodes, ...upper.nodes, { x: L, y: spacing / 2 }]
  const stage = nodes.length - 1
  return {
    frame: {
      nodes,
      elements: [...lower.elements, ...upper.elements],
      supports: [{ node: lower.first, dofs: [0, 1, 2] }, { node: upper.first, dofs: [0, 1, 2] }],
      rigidLinks: [{ master: stage, slave: lower.last }, { master: stage, slave: upper.last }],
    },
    stage,
  }
}

/** Force and stage motion along the travel; tracked[0] is the stage's motion along the blades (negative: towards the base). */
export function solveGuide(params: Record<string, number>, modulus: number, travel: number, elements = BLADE_ELEMENTS): PathResult {
  const { frame, stage } = guideFrame(params, modulus, elements)
  return followPath(frame, { control: { node: stage, dof: 1 }, target: travel, points: FE_POINTS, extrema: false, track: [{ node: stage, dof: 0 }, { node: stage, dof: 2 }] })
}

function nonlinearFe(params: Record<string, number>, modulus: number, strainLimit: number): ModelOutput {
  const estimate = linearTravelRange(params, strainLimit)
  const cap = TRAVEL_CAP_RATIO * params.length
  const path = solveGuide(params, modulus, Math.min(estimate.maxTravel * CURVE_EXTENT * 1.25, cap))
  const travel = path.control
  const strains = path.maxStrain
  const stop = strainLimitedStop(path, strainLimit, cap, 'parallel-guide')
  const warnings: string[] = stop.strainGoverned ? [] : [capWarning(params)]
  const at = (values: number[]) => sampleAt(values, stop.at)
  const maxTravel = at(travel)
  const keep = indicesUpTo(travel, maxTravel * (stop.strainGoverned ? CURVE_EXTENT : 1))
  const slope = (k: number) => path.reaction[k] / travel[k]
  const peakStrain = at(strains)
  return {
    curve: {
      displacement: keep.map((i) => travel[i]),
      force: keep.map((i) => path.reaction[i]),
      strain: keep.map((i) => strains[i]),
      axes,
    },
    metrics: {
      // Richardson on the first two points (F/δ = k0 + cδ²) gives the small-travel stiffness.
      stiffness: (4 * slope(1) - slope(2)) / 3,
      maxTravel,
      parasiticMotion: -at(path.tracked[0]),
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

export function evaluate({ params, material, method, wideBeam }: ModelInput): ModelOutput {
  // the blades bend as plate strips when deep for their thickness (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam }, params.depth, params.thickness, 'blades')
  const E = bending.modulus
  if (method === 'nonlinear-fe') return { ...nonlinearFe(params, E, material.strainLimit), bending }
  return { ...linear(params, E, material.strainLimit), bending }
}
