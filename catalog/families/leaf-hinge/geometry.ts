/**
 * Printable solid of the living hinge: a fixed link with a mounting hole, the thin blade,
 * and the moving link, all in one outline in the bending plane (xy), extruded along z by
 * `depth` so the blade bends within its layers, never across them (common practice).
 *
 * Derived dimensions (mm): both links LINK_HEIGHT = 8 across (fixed, at least twice the
 * thickest blade allowed); the moving link is `linkLength` long; the fixed link is
 * max(linkLength, FIXED_LINK_MIN = 10) long so its M3 clearance hole (HOLE_DIAMETER = 3.2,
 * centred in the fixed link) always has at least 2.4 mm of material around it.
 * Layout along x: fixed link [−fixedLength, 0], blade [0, length], moving link beyond.
 */
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, extrudeOutline, hole } from '../../geometry/outline'

export const LINK_HEIGHT = 8
export const FIXED_LINK_MIN = 10
export const HOLE_DIAMETER = 3.2
/** How far the blade reaches into each link, so the union has real overlap. */
const BLADE_ANCHOR = 1

export function layout(params: Record<string, number>) {
  const fixedLength = Math.max(params.linkLength, FIXED_LINK_MIN)
  return { fixedLength, hole: { x: -fixedLength / 2, y: 0, diameter: HOLE_DIAMETER } }
}

/** Outer size: x = fixed link + blade + moving link, y = LINK_HEIGHT, z = depth. */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  return { x: layout(params).fixedLength + params.length + params.linkLength, y: LINK_HEIGHT, z: params.depth }
}

export function build(params: Record<string, number>): Geom3 {
  const { length, thickness, depth, linkLength } = params
  const { fixedLength, hole: h } = layout(params)
  const half = LINK_HEIGHT / 2
  const solids = [
    box(-fixedLength, -half, 0, half),
    box(-BLADE_ANCHOR, -thickness / 2, length + BLADE_ANCHOR, thickness / 2),
    box(length, -half, length + linkLength, half),
  ]
  return extrudeOutline(solids, [hole(h.x, h.y, h.diameter)], depth)
}
