/**
 * Printable solid of the cantilever snap hook: a base block with a mounting hole, the arm
 * tapering linearly from rootThickness to tipThickness, and the hook head at the tip with its
 * entry (lead-in) and retaining faces. The bending plane (length × thickness) is the build
 * plane (xy) and `width` is the print height along z, so the arm bends within its layers
 * (common practice; a hook bent across its layers splits at the root).
 *
 * Layout: arm back face on y = 0, root at x = 0, tip at x = length; the front face runs from
 * (0, rootThickness) to (length, tipThickness). The head rises `undercut` above the tip's front
 * face: the entry face climbs from the tip at `entryAngle` to the arm axis, a flat land
 * HEAD_LAND = 0.5 long follows, and the retaining face falls at `retainAngle` back to the
 * front face. Both angles are measured from the arm axis (the insertion direction), as in the
 * snap-fit design equations. `friction` does not change the shape.
 * Derived dimensions (mm), fixed: base BASE_LENGTH = 8 along x, reaching BASE_MARGIN = 3 beyond
 * both arm faces in y; one hole of the M3 clearance 3.2 in the middle of the base.
 */
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { ValidationError } from '../../errors'
import { extrudeOutline, hole, polygon } from '../../geometry/outline'

export { BASE_LENGTH, BASE_MARGIN, HEAD_LAND, HOLE_DIAMETER, MAX_HEAD_SHARE, headFitProblem, layout, type SnapHookLayout } from './layout'
import { BASE_LENGTH, BASE_MARGIN, headFitProblem, layout } from './layout'

/** Outer size: x = BASE_LENGTH + length; y from −BASE_MARGIN to the higher of base top and head top; z = width. */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  const { length, rootThickness, tipThickness, undercut, width } = params
  return {
    x: BASE_LENGTH + length,
    y: Math.max(rootThickness + BASE_MARGIN, tipThickness + undercut) + BASE_MARGIN,
    z: width,
  }
}

export function build(params: Record<string, number>): Geom3 {
  const problem = headFitProblem(params)
  if (problem) throw new ValidationError([{ field: 'undercut', message: problem }])
  const { length: l, rootThickness: h0, width } = params
  const L = layout(params)
  const [, , tip, entryTop, landEnd, foot] = L.head
  // base, arm and head written as one simple outline: at shallow angles the head's faces run
  // nearly along the arm's, and a boolean union would leave slivers there
  const outline = polygon([
    [-BASE_LENGTH, -BASE_MARGIN],
    [0, -BASE_MARGIN],
    [0, 0],
    [l, 0],
    tip,
    entryTop,
    landEnd,
    foot,
    [0, h0],
    [0, h0 + BASE_MARGIN],
    [-BASE_LENGTH, h0 + BASE_MARGIN],
  ])
  return extrudeOutline([outline], [hole(L.hole.x, L.hole.y, L.hole.diameter)], width)
}
