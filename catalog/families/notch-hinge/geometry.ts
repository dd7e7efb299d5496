/**
 * Printable solid of the circular notch hinge: a block with two opposed circular cut-outs
 * leaving a neck of `neckThickness` at x = 0, and a mounting hole in each end. Outline in the
 * bending plane (xy), extruded along z by `depth` (common practice: bend within the layers).
 *
 * The cut-out centres sit radius + neckThickness/2 from the mid-plane, as in Paros & Weisbord
 * (1965), so blockThickness = neckThickness + 2·radius gives their semicircular notch; a thinner
 * block gets a shallower circular segment, a thicker one a U-shaped slot (the semicircle
 * continued by straight walls to the surface).
 * Derived dimensions (mm): each end reaches NOTCH_ARM = 10 beyond the cut-out (fixed); the
 * hole diameter is the M3 clearance 3.2, reduced to half the block thickness on thin blocks
 * (proportional), centred in each end.
 */
import type { Geom2, Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, extrudeOutline, hole, polygon, type Point } from '../../geometry/outline'


export const NOTCH_ARM = 10
export const HOLE_DIAMETER = 3.2
/** Segments of each notch circle; a multiple of 4 puts a vertex exactly at the neck. */
export const NOTCH_SEGMENTS = 192
/** The slot walls run this far past the block surface so the subtraction leaves no skin. */
const CUT_OVERRUN = 1
/**
 * Least distance (mm) between a notch-circle vertex and a block face: a vertex lying on the
 * face leaves a zero-length edge after the subtraction and an open mesh, so it is moved
 * this far off the face, on its own side (well below print resolution).
 */
export const FACE_CLEARANCE = 1e-3

/** The notch circle as a polygon whose vertices keep FACE_CLEARANCE from the faces y = ±h/2. */
function notchCircle(radius: number, centreY: number, faceY: number): Geom2 {
  const points: Point[] = []
  for (let k = 0; k < NOTCH_SEGMENTS; k++) {
    const a = (2 * Math.PI * k) / NOTCH_SEGMENTS
    let y = centreY + radius * Math.sin(a)
    for (const face of [faceY, -faceY]) {
      if (Math.abs(y - face) < FACE_CLEARANCE) y = face + (y >= face ? FACE_CLEARANCE : -FACE_CLEARANCE)
    }
    points.push([radius * Math.cos(a), y])
  }
  return polygon(points)
}

export function layout(params: Record<string, number>) {
  const { radius: R, neckThickness: t, blockThickness: h } = params
  const halfLength = R + NOTCH_ARM
  const diameter = Math.min(HOLE_DIAMETER, h / 2)
  const centreY = R + t / 2
  return {
    halfLength,
    centreY,
    /** True when the block is thicker than t + 2R and the notch continues as a slot. */
    slot: h / 2 > centreY,
    holes: [-1, 1].map((s) => ({ x: s * (R + NOTCH_ARM / 2), y: 0, diameter })),
  }
}

/** Outer size: x = 2·(radius + NOTCH_ARM), y = blockThickness, z = depth. */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  return { x: 2 * layout(params).halfLength, y: params.blockThickness, z: params.depth }
}

export function build(params: Record<string, number>): Geom3 {
  const { radius: R, depth, blockThickness: h } = params
  const L = layout(params)
  const cuts: Geom2[] = []
  for (const s of [-1, 1]) {
    cuts.push(notchCircle(R, s * L.centreY, h / 2))
    if (L.slot) {
      const outer = s * (h / 2 + CUT_OVERRUN)
      cuts.push(box(-R, Math.min(s * L.centreY, outer), R, Math.max(s * L.centreY, outer)))
    }
  }
  for (const c of L.holes) cuts.push(hole(c.x, c.y, c.diameter))
  return extrudeOutline([box(-L.halfLength, -h / 2, L.halfLength, h / 2)], cuts, depth)
}
