/**
 * Circular notch hinge under a pure bending moment: Paros & Weisbord, "How to design flexure
 * hinges", Machine Design 37:151–156, 1965 (the same integral in Lobontiu, Compliant
 * Mechanisms: Design of Flexure Hinges, CRC 2003), full and thin-neck forms.
 */
import { bendingBasis } from '../../mechanics/wide-beam'
import type { MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'
import { nonlinearFeMethod, peakStrainMetric, ROTATION_AXES, strainSafetyMetric } from '../../schema/define'
import { followPath, indicesUpTo, sampleAt, strainLimitedStop, type Frame, type FrameElement } from '../../solvers'

const DEG = 180 / Math.PI
/** Points along the curve. */
export const CURVE_POINTS = 41
/** The curve runs this far past the strain-limit rotation, so the limit sits inside the plot. */
export const CURVE_EXTENT = 1.2
/** Rotations beyond this are outside a notch hinge's working range (the cut faces close in); the range is capped here. */
export const ROTATION_CAP_DEG = 30
/** Simplified-form error above which a warning is given. */
const SIMPLIFIED_TOLERANCE = 0.05
/** Above this t/R the neck is short and the beam strain misses the notch's stress concentration (common practice). */
const THICK_NECK_RATIO = 0.5
/** Stepped elements across the notch; the compliance is within 0.1 % of a 160-element mesh (tests). */
export const NOTCH_ELEMENTS = 40
const FE_POINTS = 41

export const methods: MethodInfo[] = [
  {
    id: 'paros-weisbord',
    label: 'Paros–Weisbord (full)',
    source: 'Paros & Weisbord, How to design flexure hinges, Machine Design 37:151–156, 1965 (full circular-notch compliance; also Lobontiu, Compliant Mechanisms: Design of Flexure Hinges, CRC 2003)',
  },
  {
    id: 'paros-weisbord-simplified',
    label: 'Paros–Weisbord (thin neck)',
    source: 'Paros & Weisbord, Machine Design 37:151–156, 1965, simplified form for a neck much thinner than the notch radius',
  },
  nonlinearFeMethod('Geometrically exact planar beam elements (corotational formulation) on a stepped, variable-section beam following the notch profile, loaded by a pure moment under rotation control'),
]

export const metrics: MetricSpec[] = [
  { key: 'rotationalStiffness', label: 'Rotational stiffness', unit: 'N·mm/rad', help: 'Moment per radian of rotation of one side of the notch against the other.' },
  { key: 'maxRotation', label: 'Largest rotation', unit: 'deg', help: 'Rotation at which the neck reaches the strain limit (or the end of the working range).' },
  peakStrainMetric('Bending strain at the neck at the largest rotation (a fraction).'),
  strainSafetyMetric('rotation'),
]

export const axes = ROTATION_AXES

/**
 * Full Paros–Weisbord compliance θ/M (rad per N·mm), β = t/(2R):
 * θ/M = (3/(2EbR²))·(1/(2β+β²))·[(3+4β+2β²)/((1+β)(2β+β²)) + (6(1+β)/(2β+β²)^{3/2})·atan√((2+β)/β)].
 * The prefactor is 3/(2EbR²); a 12/(EbR²) version in circulation is 8× too large.
 */
export function parosWeisbordCompliance(modulus: number, depth: number, radius: number, neck: number): number {
  const beta = neck / (2 * radius)
  const g = 2 * beta + beta * beta
  const bracket = (3 + 4 * beta + 2 * beta * beta) / ((1 + beta) * g)
    + ((6 * (1 + beta)) / g ** 1.5) * Math.atan(Math.sqrt((2 + beta) / beta))
  return (3 / (2 * modulus * depth * radius * radius)) * (bracket / g)
}

/** Thin-neck Paros–Weisbord compliance (t ≪ R): θ/M = 9π R^{1/2}/(2 E b t^{5/2}). */
export function parosWeisbordSimplifiedCompliance(modulus: number, depth: number, radius: number, neck: number): number {
  return (9 * Math.PI * Math.sqrt(radius)) / (2 * modulus * depth * neck ** 2.5)
}

/** Bending strain at the neck under moment M: ε = 6M/(E b t²). */
export function neckStrain(moment: number, modulus: number, depth: number, neck: number): number {
  return (6 * moment) / (modulus * depth * neck * neck)
}

/** True when the block is thinner than neck + 2·radius, so the cuts are shallower than half circles. */
export function isShallowNotch(params: Record<string, number>): boolean {
  return params.blockThickness < params.neckThickness + 2 * params.radius
}

export interface RangeResult {
  /** Largest rotation in the working range, rad. */
  maxRotation: number
  /** Whether the strain limit (true) or the rotation cap (false) set it. */
  strainGoverned: boolean
}

/** Rotation at the strain limit for a linear moment–rotation law, capped at the working range. */
export function rotationRange(compliance: number, modulus: number, depth: number, neck: number, strainLimit: number): RangeResult {
  const limitMoment = (strainLimit * modulus * depth * neck * neck) / 6
  const atLimit = compliance * limitMoment
  const cap = ROTATION_CAP_DEG / DEG
  return atLimit <= cap ? { maxRotation: atLimit, strainGoverned: true } : { maxRotation: cap, strainGoverned: false }
}

/** Warnings shared by every method: the notch shape and the neck's beam strain. */
export function commonWarnings(params: Record<string, number>, range: RangeResult): string[] {
  const warnings: string[] = []
  const { radius, neckThickness } = params
  if (neckThickness / radius > THICK_NECK_RATIO) {
    warnings.push(`The neck is thick for its notch (t/R = ${(neckThickness / radius).toFixed(2)}): beam strain at the neck misses the notch's stress concentration, so the true peak strain is higher (common practice); confirm on a printed part.`)
  }
  if (!range.strainGoverned) {
    warnings.push(`The strain limit is not reached within ${ROTATION_CAP_DEG}° of rotation; the largest rotation is capped at the end of the notch's working range.`)
  }
  return warnings
}

function closedForm(params: Record<string, number>, modulus: number, strainLimit: number, simplified: boolean): ModelOutput {
  const { radius, neckThickness, depth } = params
  const full = parosWeisbordCompliance(modulus, depth, radius, neckThickness)
  const thin = parosWeisbordSimplifiedCompliance(modulus, depth, radius, neckThickness)
  const compliance = simplified ? thin : full
  const range = rotationRange(compliance, modulus, depth, neckThickness, strainLimit)
  const warnings = commonWarnings(params, range)
  if (simplified && thin / full - 1 > SIMPLIFIED_TOLERANCE) {
    warnings.push(`The thin-neck form assumes neckThickness ≪ radius; at t/R = ${(neckThickness / radius).toFixed(2)} it overstates the compliance by ${Math.round(100 * (thin / full - 1))} % against the full Paros–Weisbord form (use paros-weisbord).`)
  }
  if (isShallowNotch(params)) {
    warnings.push(`The block (${params.blockThickness} mm) is thinner than neckThickness + 2·radius (${neckThickness + 2 * radius} mm), so the cuts are shallower than half circles; the Paros–Weisbord forms assume half circles and overstate the compliance a little (nonlinear-fe follows the actual profile).`)
  }

  // Pure moment: M = θ/C holds to large rotation in beam theory (curvature M/EI integrates to θ).
  const end = range.maxRotation * (range.strainGoverned ? CURVE_EXTENT : 1)
  const displacement: number[] = []
  const force: number[] = []
  const strain: number[] = []
  for (let i = 0; i < CURVE_POINTS; i++) {
    const theta = (end * i) / (CURVE_POINTS - 1)
    const moment = theta / compliance
    displacement.push(theta * DEG)
    force.push(moment)
    strain.push(neckStrain(moment, modulus, depth, neckThickness))
  }
  const peakStrain = neckStrain(range.maxRotation / compliance, modulus, depth, neckThickness)
  return {
    curve: { displacement, force, strain, axes },
    metrics: {
      rotationalStiffness: 1 / compliance,
      maxRotation: range.maxRotation * DEG,
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

/** Thickness of the notch profile at x (mm from the neck): two circular cuts, clipped at the block. */
export function notchProfile(params: Record<string, number>, x: number): number {
  const { radius, neckThickness, blockThickness } = params
  const ax = Math.abs(x)
  if (ax >= radius) return blockThickness
  return Math.min(blockThickness, neckThickness + 2 * (radius - Math.sqrt(radius * radius - x * x)))
}

/** Half-length of the notch along the block: where the cuts leave the block surface (R for full half circles). */
export function notchHalfLength(params: Record<string, number>): number {
  const { radius, neckThickness, blockThickness } = params
  if (!isShallowNotch(params)) return radius
  const depthOfCut = (blockThickness - neckThickness) / 2
  return Math.sqrt(radius * radius - (radius - depthOfCut) ** 2)
}

/**
 * The notch as a frame of stepped beam elements along x ∈ [−X, X], clamped at −X and driven in
 * rotation at +X. Stations are spaced as √(tR)·sinh(u) for even u, fine at the neck where the
 * compliance concentrates. Each element takes the profile thickness at its mid-point; its strain
 * fibre is scaled so that curvature × fibre is the bending strain at the element's thinnest point.
 */
export function notchFrame(params: Record<string, number>, modulus: number, elements = NOTCH_ELEMENTS): { frame: Frame; tip: number } {
  const half = notchHalfLength(params)
  const scale = Math.sqrt(params.neckThickness * params.radius)
  const umax = Math.asinh(half / scale)
  const count = 2 * Math.ceil(elements / 2)
  const xs = Array.from({ length: count + 1 }, (_, i) => scale * Math.sinh(umax * ((2 * i) / count - 1)))
  xs[0] = -half
  xs[count] = half
  const nodes = xs.map((x) => ({ x, y: 0 }))
  const frameElements: FrameElement[] = []
  for (let i = 0; i < count; i++) {
    const mid = notchProfile(params, (xs[i] + xs[i + 1]) / 2)
    const thinnest = notchProfile(params, Math.abs(xs[i]) < Math.abs(xs[i + 1]) ? xs[i] : xs[i + 1])
    const inertia = (params.depth * mid ** 3) / 12
    frameElements.push({
      nodes: [i, i + 1],
      section: { modulus, area: params.depth * mid, inertia, fibre: (thinnest / 2) * (mid / thinnest) ** 3 },
    })
  }
  return { frame: { nodes, elements: frameElements, supports: [{ node: 0, dofs: [0, 1, 2] }] }, tip: count }
}

/** Moment–rotation path of the notch from the solver, to `rotation` (rad). */
export function solveNotch(params: Record<string, number>, modulus: number, rotation: number, elements = NOTCH_ELEMENTS) {
  const { frame, tip } = notchFrame(params, modulus, elements)
  return followPath(frame, { control: { node: tip, dof: 2 }, target: rotation, points: FE_POINTS, extrema: false })
}

function nonlinearFe(params: Record<string, number>, modulus: number, strainLimit: number): ModelOutput {
  const { depth, neckThickness } = params
  const estimate = rotationRange(parosWeisbordCompliance(modulus, depth, params.radius, neckThickness), modulus, depth, neckThickness, strainLimit)
  const cap = ROTATION_CAP_DEG / DEG
  const path = solveNotch(params, modulus, Math.min(estimate.maxRotation * CURVE_EXTENT * 1.25, cap))
  const rotations = path.control
  const strains = path.maxStrain
  const stop = strainLimitedStop(path, strainLimit, cap, 'notch-hinge')
  const at = (values: number[]) => sampleAt(values, stop.at)
  const maxRotation = at(rotations)
  const range: RangeResult = { maxRotation, strainGoverned: stop.strainGoverned }
  const warnings = commonWarnings(params, range)
  const keep = indicesUpTo(rotations, maxRotation * (stop.strainGoverned ? CURVE_EXTENT : 1))
  const peakStrain = at(strains)
  return {
    curve: {
      displacement: keep.map((i) => rotations[i] * DEG),
      force: keep.map((i) => path.reaction[i]),
      strain: keep.map((i) => strains[i]),
      axes,
    },
    metrics: {
      rotationalStiffness: path.reaction[1] / rotations[1],
      maxRotation: maxRotation * DEG,
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

export function evaluate({ params, material, method, wideBeam }: ModelInput): ModelOutput {
  // the neck bends as a plate strip when the hinge is deep for its neck (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam }, params.depth, params.neckThickness, 'neck')
  const E = bending.modulus
  if (method === 'nonlinear-fe') return { ...nonlinearFe(params, E, material.strainLimit), bending }
  if (method === 'paros-weisbord-simplified') return { ...closedForm(params, E, material.strainLimit, true), bending }
  return { ...closedForm(params, E, material.strainLimit, false), bending }
}
