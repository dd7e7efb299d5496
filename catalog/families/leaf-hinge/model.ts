/**
 * Living hinge / leaf-spring pivot: a thin blade clamped to a fixed link at one end and to a
 * rigid moving link at the other, loaded by a force at the end of the moving link, square to the
 * link at rest and fixed in direction. The reported moment is that of the force about the
 * blade's mid-point, so that in small rotations M = (EI/L)·θ for any link length (linear beam
 * theory: the bending moment along the blade averages to its mid-point value).
 */
import { bendingBasis } from '../../mechanics/wide-beam'
import { SolverError } from '../../errors'
import type { MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'
import { nonlinearFeMethod, peakStrainMetric, ROTATION_AXES, strainSafetyMetric } from '../../schema/define'
import { firstCrossing, followPath, meshStraight, rectangleSection, sampleAt, type Frame, type PathResult } from '../../solvers'

const DEG = 180 / Math.PI
export const CURVE_POINTS = 41
/** The curve runs this far past the strain-limit rotation, so the limit sits inside the plot. */
export const CURVE_EXTENT = 1.2
/** A force of fixed direction cannot turn the link to 90°; the working range is capped here. */
export const ROTATION_CAP_DEG = 80
/** Howell's PRBM constants for a cantilever with a force at its free end (n = 0). */
export const PRBM_GAMMA = 0.8517
export const PRBM_STIFFNESS_COEFFICIENT = 2.676
/** Parametric angle coefficient c_θ (tip angle = c_θ·Θ), Howell 2001 §5.6 (from memory). */
export const PRBM_ANGLE_COEFFICIENT = 1.2385
/** PRBM accuracy limit Θ_max ≈ 64° (Howell 2001). */
export const PRBM_ANGLE_LIMIT_DEG = 64
/**
 * At and above this link-to-blade ratio the blade is treated as a small-length flexural pivot; below
 * it the force acts practically at the blade tip and the end-force model fits better at large rotation.
 * Against the solver, the pivot model's moment is within 3 % up to 30° for ratios from 0.25 up (tests).
 */
export const SMALL_PIVOT_RATIO = 0.1
/** Below this ratio the blade is not moment-dominated and the pivot model understates the pivot drift. */
const DRIFT_RATIO = 5
/** Below this ratio and beyond this rotation the pivot model overstates the moment by more than a few per cent. */
const SHORT_LINK_RATIO = 2
const SHORT_LINK_ROTATION_DEG = 30
/** Beam elements along the blade: the moment–rotation curve is within 0.1 % of a 64-element mesh (tests). */
export const BLADE_ELEMENTS = 16
/** Points requested along the solver path. */
const FE_POINTS = 61

export const methods: MethodInfo[] = [
  {
    id: 'prbm',
    label: 'Pseudo-rigid-body model',
    source: 'Pseudo-rigid-body model: small-length flexural pivot K = EI/L (Howell & Midha, J. Mechanical Design 116:280–290, 1994); for a link shorter than the blade the end-force cantilever model, γ = 0.8517, K_Θ = 2.676 (Howell & Midha, J. Mechanical Design 117:156–165, 1995; Howell, Compliant Mechanisms, Wiley 2001, ch. 5)',
  },
  nonlinearFeMethod('Geometrically exact planar beam elements (corotational formulation) followed along the equilibrium path under displacement control; the blade meshed with beam elements, the link rigid'),
]

export const metrics: MetricSpec[] = [
  { key: 'rotationalStiffness', label: 'Rotational stiffness', unit: 'N·mm/rad', help: 'Moment about the blade mid-point per radian of link rotation, for small rotation.' },
  { key: 'maxRotation', label: 'Largest rotation', unit: 'deg', help: 'Link rotation at which the blade root reaches the strain limit (or the end of the working range).' },
  { key: 'pivotDrift', label: 'Pivot drift', unit: 'mm', help: 'How far the hinge\u2019s effective pivot has moved from the blade mid-point at the largest rotation.' },
  peakStrainMetric('Bending strain at the blade root at the largest rotation (a fraction).'),
  strainSafetyMetric('rotation'),
]

export const axes = ROTATION_AXES

export interface HingeGeometry {
  length: number
  thickness: number
  depth: number
  linkLength: number
}

export function bendingStiffness(g: HingeGeometry, modulus: number): number {
  return (modulus * g.depth * g.thickness ** 3) / 12
}

/** One state of the hinge: link rotation θ (rad), force, moment about the blade mid-point, root strain, pivot drift. */
export interface HingeState {
  rotation: number
  force: number
  moment: number
  strain: number
  drift: number
}

/**
 * Drift of the effective pivot: the point a distance (linkLength + L/2) back from the load point
 * along the link, against the blade mid-point at rest (where an ideal pin would sit).
 */
export function pivotDrift(g: HingeGeometry, load: { x: number; y: number }, rotation: number): number {
  const arm = g.linkLength + g.length / 2
  const px = load.x - arm * Math.cos(rotation)
  const py = load.y - arm * Math.sin(rotation)
  return Math.hypot(px - g.length / 2, py)
}

export type PrbmVariant = 'small-length-pivot' | 'end-force'

export function prbmVariant(g: HingeGeometry): PrbmVariant {
  return g.linkLength >= SMALL_PIVOT_RATIO * g.length ? 'small-length-pivot' : 'end-force'
}

/**
 * The PRBM state at pseudo-rigid-body angle Θ.
 * Small-length flexural pivot (Howell & Midha 1994): pin at the blade mid-point, K = EI/L, link angle = Θ;
 * the blade is taken as a circular arc (moment-dominated) for the drift.
 * End-force cantilever (Howell & Midha 1995): pin at (1 − γ)L, K = γK_Θ·EI/L, blade tip (link) angle c_θ·Θ.
 * A force of fixed direction balances the spring: KΘ = P × (horizontal arm from the pin to the load).
 */
export function prbmState(g: HingeGeometry, modulus: number, theta: number, variant = prbmVariant(g)): HingeState {
  const EI = bendingStiffness(g, modulus)
  const L = g.length
  const a = g.linkLength
  let rotation: number
  let load: { x: number; y: number }
  let force: number
  if (variant === 'small-length-pivot') {
    rotation = theta
    const arm = a + L / 2
    load = { x: L / 2 + arm * Math.cos(theta), y: arm * Math.sin(theta) }
    force = theta === 0 ? 0 : ((EI / L) * theta) / (arm * Math.cos(theta))
    // circular-arc blade: tip at (L sinθ/θ, L(1 − cosθ)/θ), link continues along θ
    const tip = theta === 0 ? { x: L, y: 0 } : { x: (L * Math.sin(theta)) / theta, y: (L * (1 - Math.cos(theta))) / theta }
    const drift = pivotDrift(g, { x: tip.x + a * Math.cos(theta), y: tip.y + a * Math.sin(theta) }, theta)
    const strain = (force * load.x * g.thickness) / (2 * EI)
    return { rotation, force, moment: force * (load.x - L / 2), strain, drift }
  }
  const gamma = PRBM_GAMMA
  rotation = PRBM_ANGLE_COEFFICIENT * theta
  load = {
    x: (1 - gamma) * L + gamma * L * Math.cos(theta) + a * Math.cos(rotation),
    y: gamma * L * Math.sin(theta) + a * Math.sin(rotation),
  }
  const K = (gamma * PRBM_STIFFNESS_COEFFICIENT * EI) / L
  force = theta === 0 ? 0 : (K * theta) / (gamma * L * Math.cos(theta) + a * Math.cos(rotation))
  const strain = (force * load.x * g.thickness) / (2 * EI)
  return { rotation, force, moment: force * (load.x - L / 2), strain, drift: pivotDrift(g, load, rotation) }
}

/**
 * Small-rotation stiffness about the blade mid-point, EI/L: the small-length flexural pivot constant
 * (Howell & Midha 1994), and exact in linear beam theory for any link length, since the bending
 * moment along the blade is linear and its mean is the mid-point value. Reported by the prbm method
 * for both variants; the end-force model's own initial slope (below) is a large-rotation fit.
 */
export function smallRotationStiffness(g: HingeGeometry, modulus: number): number {
  return bendingStiffness(g, modulus) / g.length
}

/** Small-rotation slope dM/dθ of the PRBM curve: EI/L for the small-length pivot, K(L/2 + a)/(c_θ(γL + a)) for the end-force model. */
export function prbmRotationalStiffness(g: HingeGeometry, modulus: number, variant = prbmVariant(g)): number {
  const EI = bendingStiffness(g, modulus)
  if (variant === 'small-length-pivot') return EI / g.length
  const K = (PRBM_GAMMA * PRBM_STIFFNESS_COEFFICIENT * EI) / g.length
  return (K * (g.length / 2 + g.linkLength)) / (PRBM_ANGLE_COEFFICIENT * (PRBM_GAMMA * g.length + g.linkLength))
}

/** Largest Θ with the link inside the working range and a positive lever arm for the force. */
function prbmAngleBound(variant: PrbmVariant): number {
  const cap = ROTATION_CAP_DEG / DEG
  return variant === 'small-length-pivot' ? cap : cap / PRBM_ANGLE_COEFFICIENT
}

/** Θ at which the root strain reaches the limit (bisection: strain grows monotonically with Θ), or null past the bound. */
function prbmAngleAtStrain(g: HingeGeometry, modulus: number, strainLimit: number, variant: PrbmVariant): number | null {
  const hi0 = prbmAngleBound(variant)
  if (prbmState(g, modulus, hi0, variant).strain < strainLimit) return null
  let lo = 0
  let hi = hi0
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2
    if (prbmState(g, modulus, mid, variant).strain < strainLimit) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}

export function capWarning(): string {
  return `The strain limit is not reached within ${ROTATION_CAP_DEG}° of link rotation; under a force of fixed direction the link cannot turn much further, so the largest rotation is capped there.`
}

function prbm(g: HingeGeometry, modulus: number, strainLimit: number): ModelOutput {
  const variant = prbmVariant(g)
  const atLimit = prbmAngleAtStrain(g, modulus, strainLimit, variant)
  const bound = prbmAngleBound(variant)
  const limitTheta = atLimit ?? bound
  const warnings: string[] = []
  if (atLimit === null) warnings.push(capWarning())
  if (limitTheta * DEG > PRBM_ANGLE_LIMIT_DEG) {
    warnings.push(`The pseudo-rigid-body angle at the largest rotation is ${(limitTheta * DEG).toFixed(0)}°, beyond the model's accuracy limit of about ${PRBM_ANGLE_LIMIT_DEG}° (Howell 2001); use nonlinear-fe for the curve.`)
  }
  const ratio = g.linkLength / g.length
  const maxRotationDeg = prbmState(g, modulus, limitTheta, variant).rotation * DEG
  if (variant === 'small-length-pivot' && ratio < DRIFT_RATIO) {
    warnings.push(`The link is only ${ratio.toFixed(1)}× the blade length: the pseudo-rigid-body pivot drift assumes a moment-loaded blade (link at least ${DRIFT_RATIO}× the blade) and understates the drift; use nonlinear-fe for it.`)
  }
  if (variant === 'small-length-pivot' && ratio < SHORT_LINK_RATIO && maxRotationDeg > SHORT_LINK_ROTATION_DEG) {
    warnings.push(`With a link shorter than ${SHORT_LINK_RATIO}× the blade, the small-length flexural pivot overstates the moment and strain beyond about ${SHORT_LINK_ROTATION_DEG}° of rotation; use nonlinear-fe for the curve.`)
  }
  const endTheta = Math.min(limitTheta * (atLimit === null ? 1 : CURVE_EXTENT), bound * 1.05)
  const displacement: number[] = []
  const force: number[] = []
  const strain: number[] = []
  for (let i = 0; i < CURVE_POINTS; i++) {
    const s = prbmState(g, modulus, (endTheta * i) / (CURVE_POINTS - 1), variant)
    displacement.push(s.rotation * DEG)
    force.push(s.moment)
    strain.push(s.strain)
  }
  const last = prbmState(g, modulus, limitTheta, variant)
  return {
    curve: { displacement, force, strain, axes },
    metrics: {
      rotationalStiffness: smallRotationStiffness(g, modulus),
      maxRotation: last.rotation * DEG,
      pivotDrift: last.drift,
      maxStrain: last.strain,
      safetyFactor: strainLimit / last.strain,
    },
    warnings,
  }
}

/**
 * The hinge as a frame: the blade from the clamp (node 0) to its tip, and the load point at the
 * end of the link as a master node the blade tip follows rigidly, so the load point can be driven.
 * `linkLength` may be 0 here (a plain cantilever with an end force), below the family's own minimum.
 */
export function hingeFrame(g: HingeGeometry, modulus: number, elements = BLADE_ELEMENTS): { frame: Frame; load: number } {
  const blade = meshStraight({ x: 0, y: 0 }, { x: g.length, y: 0 }, elements, rectangleSection(modulus, g.thickness, g.depth))
  const nodes = [...blade.nodes]
  if (g.linkLength === 0) {
    return { frame: { nodes, elements: blade.elements, supports: [{ node: 0, dofs: [0, 1, 2] }] }, load: blade.last }
  }
  nodes.push({ x: g.length + g.linkLength, y: 0 })
  const load = nodes.length - 1
  return {
    frame: { nodes, elements: blade.elements, supports: [{ node: 0, dofs: [0, 1, 2] }], rigidLinks: [{ master: load, slave: blade.last }] },
    load,
  }
}

/** Hinge states along a solver path that drives the load point across the link. */
export function solveHinge(g: HingeGeometry, modulus: number, travel: number, elements = BLADE_ELEMENTS): { states: HingeState[]; path: PathResult } {
  const { frame, load } = hingeFrame(g, modulus, elements)
  const path = followPath(frame, {
    control: { node: load, dof: 1 },
    target: travel,
    points: FE_POINTS,
    extrema: false,
    track: [{ node: load, dof: 0 }, { node: load, dof: 2 }],
  })
  const x0 = g.length + g.linkLength
  const states = path.control.map((uy, i): HingeState => {
    const x = x0 + path.tracked[0][i]
    const rotation = path.tracked[1][i]
    return {
      rotation,
      force: path.reaction[i],
      moment: path.reaction[i] * (x - g.length / 2),
      strain: path.maxStrain[i],
      drift: pivotDrift(g, { x, y: uy }, rotation),
    }
  })
  return { states, path }
}

function nonlinearFe(g: HingeGeometry, modulus: number, strainLimit: number): ModelOutput {
  const variant = prbmVariant(g)
  const cap = ROTATION_CAP_DEG / DEG
  // Aim the drive past the PRBM's strain-limit point; widen once if the limit is not reached.
  const estimate = prbmAngleAtStrain(g, modulus, strainLimit, variant) ?? prbmAngleBound(variant)
  const reach = Math.min(prbmState(g, modulus, estimate, variant).rotation * CURVE_EXTENT * 1.1, cap * 1.05)
  const arm = g.linkLength + g.length / 2
  let travel = arm * Math.sin(reach)
  let solved = solveHinge(g, modulus, travel)
  const rotations = () => solved.states.map((s) => s.rotation)
  const strains = () => solved.states.map((s) => s.strain)
  let atLimit = firstCrossing(strains(), strainLimit)
  let atCap = firstCrossing(rotations(), cap)
  if (atLimit === null && atCap === null) {
    travel = Math.min(travel * 1.6, (g.linkLength + g.length) * Math.sin(cap * 1.05))
    solved = solveHinge(g, modulus, travel)
    atLimit = firstCrossing(strains(), strainLimit)
    atCap = firstCrossing(rotations(), cap)
  }
  const governing = atLimit !== null && (atCap === null || atLimit <= atCap) ? atLimit : atCap
  if (governing === null) {
    throw new SolverError('leaf-hinge: the path ended before the strain limit or the end of the working range', { travel })
  }
  const warnings: string[] = []
  if (governing === atCap && governing !== atLimit) warnings.push(capWarning())
  const pick = (f: (s: HingeState) => number) => sampleAt(solved.states.map(f), governing)

  // Keep the curve to a little past the limit, as the closed forms do.
  const endRotation = Math.min(pick((s) => s.rotation) * (governing === atLimit ? CURVE_EXTENT : 1), cap * 1.05)
  const kept = solved.states.filter((s) => s.rotation <= endRotation + 1e-12)
  const slope = (k: number) => solved.states[k].moment / solved.states[k].rotation
  // Richardson on the first two points (M/θ = k0 + cθ²) gives the small-rotation stiffness.
  const stiffness = (4 * slope(1) - slope(2)) / 3
  const peakStrain = pick((s) => s.strain)
  return {
    curve: {
      displacement: kept.map((s) => s.rotation * DEG),
      force: kept.map((s) => s.moment),
      strain: kept.map((s) => s.strain),
      axes,
    },
    metrics: {
      rotationalStiffness: stiffness,
      maxRotation: pick((s) => s.rotation) * DEG,
      pivotDrift: pick((s) => s.drift),
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

export function geometryOf(params: Record<string, number>): HingeGeometry {
  return { length: params.length, thickness: params.thickness, depth: params.depth, linkLength: params.linkLength }
}

export function evaluate({ params, material, method, wideBeam }: ModelInput): ModelOutput {
  // the leaf bends as a plate strip when deep for its thickness (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam }, params.depth, params.thickness, 'leaf')
  const E = bending.modulus
  if (method === 'nonlinear-fe') return { ...nonlinearFe(geometryOf(params), E, material.strainLimit), bending }
  return { ...prbm(geometryOf(params), E, material.strainLimit), bending }
}
