/**
 * Wide beams: the bending modulus a beam of rectangular section bends with, by its proportions.
 *
 * A beam much deeper (out of the bending plane) than thick cannot contract sideways through its
 * depth as it bends (the anticlastic curvature is confined to its edges), so it bends as a strip of
 * plate in cylindrical bending: flexural rigidity D = E·t³/(12·(1−ν²)) per unit depth instead of
 * E·t³/12 — Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells (2nd ed., 1959), §1–2,
 * "Bending of long rectangular plates to a cylindrical surface". In that state the strip is in plane
 * strain across its depth, so its stretching stiffness carries the same factor, and a beam model
 * takes E' = E/(1−ν²) in place of E throughout its section (bending and axial alike).
 *
 * Which beams are wide: the rule on proportions stated in Senturia, Microsystem Design (Kluwer,
 * 2001), ch. 9 — a beam whose depth is more than about five times its thickness is treated as a
 * wide beam with the plate modulus, a narrower one with E (rule and factor five from memory).
 * A stated simplification: the curvature-dependent transition (Ashwell's parameter b²/(R·t):
 * a free-edged strip reaches the full plate rigidity only once it is large) is not modelled; the
 * clamped roots, where these parts bend most, hold the section flat, which is what the rule
 * assumes. The correction is therefore the upper end of plate action, and 'off' its lower end.
 *
 * 'off' is plain beam theory with E alone. The one place the correction is made: every family
 * model and every search estimator takes its modulus from `bendingModulus`.
 */

export const WIDE_BEAM_MODES = ['auto', 'off'] as const
export type WideBeamMode = (typeof WIDE_BEAM_MODES)[number]
export const DEFAULT_WIDE_BEAM: WideBeamMode = 'auto'

/** Depth over thickness at and above which a beam bends as a plate strip (Senturia's rule, from memory). */
const WIDE_BEAM_RATIO = 5

/** What the correction needs besides the section: the material's Poisson's ratio and the mode. */
export interface BendingMaterial {
  poissonRatio: number
  wideBeam: WideBeamMode
}

/** How a model's modulus was taken, for "How this is computed" and the data sheet. */
export interface BendingBasis {
  wideBeam: WideBeamMode
  poissonRatio: number
  /** Depth over thickness of the section the rule was applied to. */
  depthOverThickness: number
  /** E_bending / E: 1/(1−ν²) for a wide beam under 'auto', 1 otherwise. */
  factor: number
  /** The modulus the model bent the beams with, MPa. */
  modulus: number
  /** One sentence naming the rule and its source. */
  statement: string
}

/** The factor E_bending/E for a section of this depth and thickness (both mm). */
function wideBeamFactor(poissonRatio: number, depth: number, thickness: number, mode: WideBeamMode): number {
  if (mode === 'off') return 1
  return depth >= WIDE_BEAM_RATIO * thickness ? 1 / (1 - poissonRatio * poissonRatio) : 1
}

/** The modulus (MPa) a beam of this depth and thickness bends with: E, or E/(1−ν²) when wide under 'auto'. */
export function bendingModulus(modulus: number, bending: BendingMaterial, depth: number, thickness: number): number {
  return modulus * wideBeamFactor(bending.poissonRatio, depth, thickness, bending.wideBeam)
}

function fmt(v: number, digits = 3): string {
  return String(Number(v.toPrecision(digits)))
}

/** The basis of a model's modulus, with the sentence shown under "How this is computed". */
export function bendingBasis(modulus: number, bending: BendingMaterial, depth: number, thickness: number, what = 'beam'): BendingBasis {
  const factor = wideBeamFactor(bending.poissonRatio, depth, thickness, bending.wideBeam)
  const ratio = depth / thickness
  const nu = fmt(bending.poissonRatio, 2)
  const rule = `depth/thickness ≥ ${WIDE_BEAM_RATIO} (Senturia, Microsystem Design, ch. 9); plate rigidity E·t³/(12(1−ν²)) from Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells, cylindrical bending`
  const section = `${what}: depth ${fmt(ratio)} × thickness`
  const statement = bending.wideBeam === 'off'
    ? `Wide-beam correction off (${section}): plain beam theory with E = ${fmt(modulus, 4)} MPa.`
    : factor > 1
      ? `Wide beam (${section}, at least ${WIDE_BEAM_RATIO}): bent as a plate strip with E/(1−ν²) = ${fmt(modulus * factor, 4)} MPa (ν = ${nu}, ×${fmt(factor, 4)}); rule: ${rule}.`
      : `Narrow beam (${section}, under ${WIDE_BEAM_RATIO}): bent with E = ${fmt(modulus, 4)} MPa; rule: ${rule}.`
  return { wideBeam: bending.wideBeam, poissonRatio: bending.poissonRatio, depthOverThickness: ratio, factor, modulus: modulus * factor, statement }
}
