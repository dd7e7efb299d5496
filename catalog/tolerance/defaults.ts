import type { ManufacturingTolerance } from '../window/schema'

/**
 * Default manufacturing tolerance for FDM parts — common practice, not a published value:
 * walls come out within about ±0.05 mm of the model on a tuned printer, and the modulus of a
 * printed part differs from the filament's nominal value by ±10 % at least (docs/references.md §8:
 * it spreads ±20–30 % with process and orientation, so calibrate it with a measured coupon).
 * Force grows with the cube of thickness, so the wall tolerance usually dominates.
 */
export const DEFAULT_TOLERANCE: Readonly<ManufacturingTolerance> = Object.freeze({ thickness: 0.05, modulus: 0.1 })

export const DEFAULT_TOLERANCE_NOTE =
  'Default tolerance ±0.05 mm on walls and ±10 % on modulus is common FDM practice, not a published value; ' +
  'printed moduli spread ±20–30 % with process and orientation, so calibrate with a measured coupon.'

export function resolveTolerance(given?: Partial<ManufacturingTolerance>): ManufacturingTolerance {
  return { thickness: given?.thickness ?? DEFAULT_TOLERANCE.thickness, modulus: given?.modulus ?? DEFAULT_TOLERANCE.modulus }
}
