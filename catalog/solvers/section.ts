import type { Section } from './types'

/**
 * Solid rectangular section bending in the plane of the frame.
 * @param modulus Young's modulus E, MPa
 * @param thickness in-plane thickness t (the bending direction), mm
 * @param depth out-of-plane depth b (the print height), mm
 */
export function rectangleSection(modulus: number, thickness: number, depth: number): Section {
  if (!(modulus > 0) || !(thickness > 0) || !(depth > 0)) {
    throw new RangeError('rectangleSection: modulus, thickness and depth must be positive')
  }
  return { modulus, area: thickness * depth, inertia: (depth * thickness ** 3) / 12, fibre: thickness / 2 }
}
