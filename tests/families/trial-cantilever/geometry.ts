/** The made-up family's solid: a base block and the blade along x, extruded along z by the depth. */
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, extrudeOutline } from '../../../catalog/geometry/outline'

export const BASE = 6

export function envelope(p: Record<string, number>): { x: number; y: number; z: number } {
  return { x: BASE + p.length, y: BASE, z: p.depth }
}

export function build(p: Record<string, number>): Geom3 {
  return extrudeOutline([box(-BASE, 0, 0, BASE), box(0, 0, p.length, p.thickness)], [], p.depth)
}
