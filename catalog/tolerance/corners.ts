/**
 * The manufacturing-tolerance corners of a configuration: every 'wall' parameter moved
 * together by ±dt (they come off the same nozzle) and the modulus scaled by 1 ± f.
 * A corner value outside the family's own range is clamped, with a warning.
 */
import type { FamilyDefinition } from '../schema/types'
import type { ManufacturingTolerance } from '../window/schema'

/** The modulus range the parameter schema accepts (catalog/schema/validate.ts), MPa. */
export const MODULUS_RANGE: readonly [number, number] = [1, 20000]

export interface ToleranceCorner {
  /** −1, 0 or +1: which way the walls moved. */
  thickness: -1 | 0 | 1
  /** −1, 0 or +1: which way the modulus moved. */
  modulus: -1 | 0 | 1
  /** Numeric family parameters at this corner. */
  params: Record<string, number>
  /** Modulus at this corner, MPa. */
  modulusValue: number
}

function wallKeys(family: FamilyDefinition): string[] {
  return family.params.filter((p) => p.role === 'wall').map((p) => p.key)
}

const fmt = (v: number) => String(Number(v.toPrecision(6)))

/** The four corners (fewer when a tolerance is zero: coinciding corners are listed once). */
export function toleranceCorners(
  family: FamilyDefinition,
  params: Record<string, number>,
  modulus: number,
  tolerance: ManufacturingTolerance,
  warnings: string[],
): ToleranceCorner[] {
  const walls = wallKeys(family)
  const tSigns: Array<-1 | 0 | 1> = tolerance.thickness > 0 && walls.length ? [-1, 1] : [0]
  const eSigns: Array<-1 | 0 | 1> = tolerance.modulus > 0 ? [-1, 1] : [0]
  const clampedOnce = new Set<string>()
  const clampNote = (key: string, wanted: number, got: number, unit: string) => {
    const note = `${key} ${fmt(wanted)}${unit} at a tolerance corner is outside the model's range; clamped to ${fmt(got)}${unit}, so the band is narrower than the tolerance on that side`
    if (!clampedOnce.has(note)) { clampedOnce.add(note); warnings.push(note) }
  }
  const corners: ToleranceCorner[] = []
  for (const ts of tSigns) {
    const shifted: Record<string, number> = { ...params }
    for (const key of walls) {
      const spec = family.params.find((p) => p.key === key)!
      const wanted = params[key] + ts * tolerance.thickness
      const got = Math.min(spec.max, Math.max(spec.min, wanted))
      if (got !== wanted) clampNote(key, wanted, got, spec.unit ? ` ${spec.unit}` : '')
      shifted[key] = got
    }
    for (const es of eSigns) {
      const wanted = modulus * (1 + es * tolerance.modulus)
      const got = Math.min(MODULUS_RANGE[1], Math.max(MODULUS_RANGE[0], wanted))
      if (got !== wanted) clampNote('modulus', wanted, got, ' MPa')
      corners.push({ thickness: ts, modulus: es, params: shifted, modulusValue: got })
    }
  }
  return corners
}
