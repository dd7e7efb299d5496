/**
 * Living hinge / leaf-spring pivot: a thin blade clamped to a fixed link at one end and to a
 * rigid moving link at the other, loaded by a force at the end of the moving link, square to the
 * link at rest and fixed in direction. The reported moment is that of the force about the
 * blade's mid-point, so that in small rotations M = (EI/L)·θ for any link length (linear beam
 * theory: the bending moment along the blade averages to its mid-point value).
 */
import type { AxisSpec, MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'

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
/** At and above this link-to-blade ratio the blade is treated as a small-length flexural pivot. */
export const SMALL_PIVOT_RATIO = 1

export const methods: MethodInfo[] = [
  {
    id: 'prbm',
    label: 'Pseudo-rigid-body model',
    source: 'Pseudo-rigid-body model: small-length flexural pivot K = EI/L (Howell & Midha, J. Mechanical Design 116:280–290, 1994); for a link shorter than the blade the end-force cantilever model, γ = 0.8517, K_Θ = 2.676 (Howell & Midha, J. Mechanical Design 117:156–165, 1995; Howell, Compliant Mechanisms, Wiley 2001, ch. 5)',
  },
]

export const metrics: MetricSpec[] = [
  { key: 'rotationalStiffness', label: 'Rotational stiffness', unit: 'N·mm/rad', help: 'Moment about the blade mid-point per radian of link rotation, for small rotation.' },
  { key: 'maxRotation', label: 'Largest rotation', unit: 'deg', help: 'Link rotation at which the blade root reaches the strain limit (or the end of the working range).' },
  { key: 'pivotDrift', label: 'Pivot drift', unit: 'mm', help: 'How far the hinge\u2019s effective pivot has moved from the blade mid-point at the largest rotation.' },
  { key: 'maxStrain', label: 'Peak strain', unit: '', help: 'Bending strain at the blade root at the largest rotation (a fraction).' },
  { key: 'safetyFactor', label: 'Strain safety factor', unit: '', help: 'Strain limit over the peak strain; 1 when the strain limit sets the largest rotation.' },
]

export const axes: { displacement: AxisSpec; force: AxisSpec } = {
  displacement: { label: 'Rotation', unit: 'deg' },
  force: { label: 'Moment', unit: 'N·mm' },
}

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

/** Small-rotation slope dM/dθ of the PRBM: EI/L for the small-length pivot, K(L/2 + a)/(c_θ(γL + a)) for the end-force model. */
export function prbmRotationalStiffness(g: HingeGeometry, modulus: number, variant = prbmVariant(g)): number {
  const EI = bendingStiffness(g, modulus)
  if (variant === 'small-length-pivot') return EI / g.length
  const K = (PRBM_GAMMA * PRBM_STIFFNESS_COEFFICIENT * EI) / g.length
  return (K * (g.length / 2 + g.linkLength)) / (PRBM_ANGLE_COEFFICIENT * (PRBM_GAMMA * g.length + g.linkLength))
}

/** Largest Θ with the link inside the working range and a positive lever arm for the force. */
function prbmAngleBound(g: HingeGeometry, variant: PrbmVariant): number {
  const cap = ROTATION_CAP_DEG / DEG
  return variant === 'small-length-pivot' ? cap : cap / PRBM_ANGLE_COEFFICIENT
}

/** Θ at which the root strain reaches the limit (bisection: strain grows monotonically with Θ), or null past the bound. */
function prbmAngleAtStrain(g: HingeGeometry, modulus: number, strainLimit: number, variant: PrbmVariant): number | null {
  const hi0 = prbmAngleBound(g, variant)
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
  const bound = prbmAngleBound(g, variant)
  const limitTheta = atLimit ?? bound
  const warnings: string[] = []
  if (atLimit === null) warnings.push(capWarning())
  if (limitTheta * DEG > PRBM_ANGLE_LIMIT_DEG) {
    warnings.push(`The pseudo-rigid-body angle at the largest rotation is ${(limitTheta * DEG).toFixed(0)}°, beyond the model's accuracy limit of about ${PRBM_ANGLE_LIMIT_DEG}° (Howell 2001); use nonlinear-fe for the curve.`)
  }
  if (variant === 'end-force') {
    warnings.push(`The link (${g.linkLength} mm) is shorter than the blade (${g.length} mm): the end-force cantilever constants, fitted for a force at the blade tip, are used with the link added, which is an approximation; use nonlinear-fe.`)
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
      rotationalStiffness: prbmRotationalStiffness(g, modulus, variant),
      maxRotation: last.rotation * DEG,
      pivotDrift: last.drift,
      maxStrain: last.strain,
      safetyFactor: strainLimit / last.strain,
    },
    warnings,
  }
}

export function geometryOf(params: Record<string, number>): HingeGeometry {
  return { length: params.length, thickness: params.thickness, depth: params.depth, linkLength: params.linkLength }
}

export function evaluate({ params, material }: ModelInput): ModelOutput {
  return prbm(geometryOf(params), material.modulus, material.strainLimit)
}
