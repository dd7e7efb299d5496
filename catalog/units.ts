/**
 * Units shared by the API and the web client, defined once: the test-stand file units a
 * measured curve may be in, their factors to the catalog's mm and N, and degrees to radians.
 *
 * Exact factors, NIST Special Publication 811 (2008), Appendix B.8: inch → metre 2.54 E−02
 * (exact); gram-force → newton 9.806 65 E−03 (exact, standard gravity); pound-force → newton
 * 4.448 222 E+00, here to the exact value 0.453 592 37 kg × 9.806 65 m/s² = 4.448 221 615 260 5 N.
 */

/** Factors from a linear displacement unit to mm. */
const LENGTH_TO_MM = { mm: 1, in: 25.4 } as const
/** Factors from a force unit to N. */
const FORCE_TO_N = { N: 1, gf: 0.00980665, lbf: 4.4482216152605 } as const

/** A linear curve's file units; hinge families plot rotation (deg) against moment (N·mm), read as they are. */
const LINEAR_DISPLACEMENT_UNITS = ['mm', 'in'] as const
const LINEAR_FORCE_UNITS = ['N', 'gf', 'lbf'] as const
const ROTATION_UNITS = ['deg'] as const
const MOMENT_UNITS = ['N·mm'] as const

export const DISPLACEMENT_UNITS = [...LINEAR_DISPLACEMENT_UNITS, ...ROTATION_UNITS] as const
export const FORCE_UNITS = [...LINEAR_FORCE_UNITS, ...MOMENT_UNITS] as const
export type DisplacementUnit = (typeof DISPLACEMENT_UNITS)[number]
export type ForceUnit = (typeof FORCE_UNITS)[number]

/** The factor that takes a file's displacement column to the entry's axis (mm, or deg as it is); 1 for a unit it does not know. */
export function displacementFactor(unit: string): number {
  return Object.hasOwn(LENGTH_TO_MM, unit) ? LENGTH_TO_MM[unit as keyof typeof LENGTH_TO_MM] : 1
}

/** The factor that takes a file's force column to the entry's axis (N, or N·mm as it is); 1 for a unit it does not know. */
export function forceFactor(unit: string): number {
  return Object.hasOwn(FORCE_TO_N, unit) ? FORCE_TO_N[unit as keyof typeof FORCE_TO_N] : 1
}

/** The units a test-stand file may be in for an entry whose curve is drawn in `displacementAxisUnit`. */
export function fileUnitChoices(displacementAxisUnit: string | undefined): { displacement: readonly DisplacementUnit[]; force: readonly ForceUnit[] } {
  return displacementAxisUnit === 'deg'
    ? { displacement: ROTATION_UNITS, force: MOMENT_UNITS }
    : { displacement: LINEAR_DISPLACEMENT_UNITS, force: LINEAR_FORCE_UNITS }
}

/** One degree in radians (a stiffness per radian times this is per degree). */
export const RAD_PER_DEG = Math.PI / 180
