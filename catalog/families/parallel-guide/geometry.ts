/**
 * Printable solid of the parallel-blade guide: a fixed base with mounting holes, two parallel
 * blades along x (centrelines at y = ±spacing/2) and a rigid stage that translates in y.
 * Outline in the bending plane (xy), extruded along z by `depth` (common practice).
 *
 * Derived dimensions (mm), fixed: base BASE_LENGTH = 8 and stage STAGE_LENGTH = 8 along x;
 * both reach GUIDE_MARGIN = 4 beyond each blade centreline in y. The base carries two M3
 * clearance holes (3.2) on the blade lines when the spacing leaves a 2 mm web between them,
 * otherwise one hole on the axis; the stage one hole on the axis for the payload.
 */
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, extrudeOutline, hole } from '../../geometry/outline'

export const BASE_LENGTH = 8
export const STAGE_LENGTH = 8
export const GUIDE_MARGIN = 4
export const HOLE_DIAMETER = 3.2
const MIN_WEB = 2
const BLADE_ANCHOR = 1

export function layout(params: Record<string, number>) {
  const { length, spacing } = params
  const baseX = -BASE_LENGTH / 2
  const baseHoles = spacing >= HOLE_DIAMETER + MIN_WEB
    ? [{ x: baseX, y: -spacing / 2, diameter: HOLE_DIAMETER }, { x: baseX, y: spacing / 2, diameter: HOLE_DIAMETER }]
    : [{ x: baseX, y: 0, diameter: HOLE_DIAMETER }]
  return { halfHeight: spacing / 2 + GUIDE_MARGIN, holes: [...baseHoles, { x: length + STAGE_LENGTH / 2, y: 0, diameter: HOLE_DIAMETER }] }
}

/** Outer size: x = base + blade length + stage, y = spacing + 2·GUIDE_MARGIN, z = depth. */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  return { x: BASE_LENGTH + params.length + STAGE_LENGTH, y: params.spacing + 2 * GUIDE_MARGIN, z: params.depth }
}

export function build(params: Record<string, number>): Geom3 {
  const { length, thickness, depth, spacing } = params
  const L = layout(params)
  const solids = [
    box(-BASE_LENGTH, -L.halfHeight, 0, L.halfHeight),
    box(length, -L.halfHeight, length + STAGE_LENGTH, L.halfHeight),
  ]
  for (const yc of [-spacing / 2, spacing / 2]) {
    solids.push(box(-BLADE_ANCHOR, yc - thickness / 2, length + BLADE_ANCHOR, yc + thickness / 2))
  }
  return extrudeOutline(solids, L.holes.map((c) => hole(c.x, c.y, c.diameter)), depth)
}
