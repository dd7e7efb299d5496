/**
 * Cantilever snap-fit hook: the standard snap-fit design equations (plastics suppliers'
 * snap-fit design guides; Bonenberger, The First Snap-Fit Handbook, Hanser 2005), with the
 * taper correction taken from the cantilever beam integral rather than a lookup table.
 */
import { bendingBasis } from '../../mechanics/wide-beam'
import type { AxisSpec, MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'
import { strainLimitMetric, strainSafetyMetric } from '../../schema/define'

const DEG = Math.PI / 180
/** Points along the insertion travel. */
const CURVE_POINTS = 41
/** Below this |1 − r| the closed form of the taper integral loses digits to cancellation; its series takes over. */
const TAPER_SERIES_BELOW = 0.1
/** Arm deflection over length above which small-deflection beam theory is a few per cent off (common practice). */
const LARGE_DEFLECTION_RATIO = 0.2

export const methods: MethodInfo[] = [
  {
    id: 'snap-fit-equations',
    label: 'Snap-fit design equations',
    source: 'Cantilever beam theory with the standard snap-fit design equations (plastics suppliers\u2019 snap-fit design guides; Bonenberger, The First Snap-Fit Handbook, Hanser 2005); taper factor from the beam integral',
  },
]

export const metrics: MetricSpec[] = [
  { key: 'deflectionForce', label: 'Deflection force', unit: 'N', help: 'Force across the arm that deflects the hook by the undercut.' },
  { key: 'matingForce', label: 'Mating force', unit: 'N', help: 'Push needed to assemble, along the insertion direction, over the entry face.' },
  { key: 'separationForce', label: 'Separation force', unit: 'N', help: 'Pull needed to take the parts apart over the retaining face; empty when the face locks.' },
  { key: 'rootStrain', label: 'Root strain', unit: '', help: 'Bending strain at the arm root at full deflection (a fraction).' },
  strainLimitMetric('Permissible strain of the material (a fraction).'),
  strainSafetyMetric('deflection', 'Strain limit over root strain; below 1 the hook is overstrained.'),
]

export const axes: { displacement: AxisSpec; force: AxisSpec } = {
  displacement: { label: 'Insertion travel', unit: 'mm' },
  force: { label: 'Insertion force', unit: 'N' },
}

/**
 * J(r) = ∫₀¹ (1 − ξ)² / (1 − (1 − r)ξ)³ dξ for an arm whose thickness tapers linearly from h
 * at the root to r·h at the tip: tip deflection y = J·P l³/(E I_root). J(1) = 1/3 (prismatic).
 */
export function taperIntegral(ratio: number): number {
  const k = 1 - ratio
  if (Math.abs(k) < TAPER_SERIES_BELOW) {
    // expanding (1 − kξ)⁻³ term by term gives J = Σ kⁿ/(n + 3); 20 terms leave < 1e-20
    let sum = 0
    for (let n = 19; n >= 0; n--) sum = sum * k + 1 / (n + 3)
    return sum
  }
  return (-Math.log(ratio) - 1.5 + 2 * ratio - (ratio * ratio) / 2) / (k * k * k)
}

/**
 * Permissible-deflection factor c in y = c·ε·l²/h (root strain ε): c = 2J(r);
 * 2/3 for a prismatic arm, ≈ 1.09 for a taper to h/2 (the values printed in the guides).
 */
export function taperFactor(ratio: number): number {
  return 2 * taperIntegral(ratio)
}

/** Tip deflection at which the root reaches `strain`: y = c·ε·l²/h. */
export function permissibleDeflection(strain: number, length: number, rootThickness: number, ratio = 1): number {
  return (taperFactor(ratio) * strain * length * length) / rootThickness
}

/** Force across the arm tip for tip deflection y: P = E I_root y/(J l³); = 3EIy/l³ = b h² E ε/(6 l) when prismatic. */
export function deflectionForce(modulus: number, width: number, rootThickness: number, length: number, deflection: number, ratio = 1): number {
  const inertia = (width * rootThickness ** 3) / 12
  return (modulus * inertia * deflection) / (taperIntegral(ratio) * length ** 3)
}

/** Root bending strain for tip deflection y: ε = 6 P l/(E b h²) = h y/(2 J l²). */
export function rootStrainAt(deflection: number, length: number, rootThickness: number, ratio = 1): number {
  return (rootThickness * deflection) / (2 * taperIntegral(ratio) * length * length)
}

/**
 * Force along the insertion (or withdrawal) direction that pushes the arm aside with force P
 * over a face at `angle` degrees: W = P(μ + tan α)/(1 − μ tan α). Null when the face locks
 * (α ≥ 90° or 1 − μ tan α ≤ 0): no finite push slides the arm over it.
 */
export function wedgeForce(deflectionForceValue: number, friction: number, angle: number): number | null {
  if (angle >= 90) return null
  const t = Math.tan(angle * DEG)
  const denominator = 1 - friction * t
  if (denominator <= 0) return null
  return (deflectionForceValue * (friction + t)) / denominator
}

function pct(v: number): string {
  return `${(v * 100).toFixed(2)} %`
}

export function evaluate({ params, material, wideBeam }: ModelInput): ModelOutput {
  const { length, rootThickness, tipThickness, width, undercut, entryAngle, retainAngle, friction } = params
  // the arm bends as a plate strip when it is wide for its root thickness (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam }, width, rootThickness, 'arm')
  const E = bending.modulus
  const ratio = tipThickness / rootThickness
  const warnings: string[] = []

  const P = deflectionForce(E, width, rootThickness, length, undercut, ratio)
  const strain = rootStrainAt(undercut, length, rootThickness, ratio)
  const mating = wedgeForce(P, friction, entryAngle)
  if (mating === null) throw new Error('entry face locks: the entryAngle/friction rule should have refused this input')
  const separation = wedgeForce(P, friction, retainAngle)

  // Insertion: the entry face pushes the arm aside by travel·tan(entryAngle) until the undercut is passed.
  const tanEntry = Math.tan(entryAngle * DEG)
  const travel = undercut / tanEntry
  const displacement: number[] = []
  const force: number[] = []
  const strainCurve: number[] = []
  for (let i = 0; i < CURVE_POINTS; i++) {
    const x = (travel * i) / (CURVE_POINTS - 1)
    const y = x * tanEntry
    displacement.push(x)
    force.push(wedgeForce(deflectionForce(E, width, rootThickness, length, y, ratio), friction, entryAngle) as number)
    strainCurve.push(rootStrainAt(y, length, rootThickness, ratio))
  }

  if (strain > material.strainLimit) {
    const allowed = permissibleDeflection(material.strainLimit, length, rootThickness, ratio)
    warnings.push(`Root strain ${pct(strain)} exceeds the strain limit ${pct(material.strainLimit)}: the permissible deflection is ${allowed.toPrecision(3)} mm, below the ${undercut} mm undercut; the hook may crack or take a set on assembly.`)
  }
  if (separation === null) {
    warnings.push(`The retaining face locks (retainAngle ${retainAngle}°, friction ${friction}): the hook cannot be pulled out without releasing the arm by hand, and a pull loads the arm in shear and the hook in bending instead.`)
  }
  if (undercut / length > LARGE_DEFLECTION_RATIO) {
    warnings.push(`The undercut is ${Math.round((100 * undercut) / length)} % of the arm length: the small-deflection snap-fit equations lose accuracy beyond about ${LARGE_DEFLECTION_RATIO * 100} %; confirm on a printed part.`)
  }

  return {
    curve: { displacement, force, strain: strainCurve, axes },
    metrics: {
      deflectionForce: P,
      matingForce: mating,
      separationForce: separation,
      rootStrain: strain,
      strainLimit: material.strainLimit,
      safetyFactor: material.strainLimit / strain,
    },
    warnings,
    bending,
  }
}
