/**
 * Printable solid of the bistable curved-beam module: a U-shaped frame, two identical cosine
 * beams stacked one above the other, optional compliant side posts, and a rigid shuttle with
 * a push pad at mid-span. The bending plane is the build plane (xy); the part is extruded
 * along z by `depth`, so layers are never peeled apart by the bending (common practice).
 *
 * Derived dimensions (mm) — fixed unless stated:
 * - frame side walls FRAME_WALL = 8 wide, base bar FRAME_BASE = 4 high, walls rise
 *   WALL_ABOVE_BEAM = 3 above the upper beam;
 * - one M3 clearance hole (HOLE_DIAMETER = 3.2) in the foot of each side wall;
 * - clear gap between the beams BEAM_GAP = 3 (rigid ends) — with posts the gap grows so the
 *   upper posts' ledges clear the lower beam: gap = postLength + LEDGE + POST_CLEARANCE;
 * - shuttle width proportional, 0.1·span (at least 2), push pad twice as wide, PAD_HEIGHT = 2;
 * - the shuttle travels 2·apexHeight (to the mirrored position) and still clears the base bar
 *   by TRAVEL_CLEARANCE = 1.5; the pad clears the upper beam by apexHeight/2 + 1.
 * Beams are sampled with BEAM_SEGMENTS = 240 segments each (see catalog/geometry/outline).
 */
import type { Geom2, Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, cosineBeamPoints, extrudeOutline, hole, polygon, postedBeamPoints } from '../../geometry/outline'

export const FRAME_WALL = 8
export const FRAME_BASE = 4
export const WALL_ABOVE_BEAM = 3
export const HOLE_DIAMETER = 3.2
export const BEAM_GAP = 3
export const POST_CLEARANCE = 1.5
export const LEDGE = 3
export const PAD_HEIGHT = 2
export const TRAVEL_CLEARANCE = 1.5
/** Depth of the shuttle below the lower beam's bottom face at mid-span. */
export const SHUTTLE_MARGIN = 1
/** How far the rigid blocks (pedestals, ledges) and posts reach into what holds them. */
const ANCHOR_OVERLAP = 1

export interface BistableBeamLayout {
  /** x of the frame's inner face on the left (0 for rigid ends; the right face mirrors at span − innerX). */
  innerX: number
  /** Vertical offset of the upper beam's centreline above the lower one. */
  beamOffset: number
  shuttleWidth: number
  padWidth: number
  /** Shuttle from shuttleBottom to padTop; the pad occupies [padBottom, padTop]. */
  shuttleBottom: number
  padBottom: number
  padTop: number
  /** Top of the base bar (bottom of the window) and bottom of the frame. */
  baseTop: number
  frameBottom: number
  wallTop: number
  holes: { x: number; y: number; diameter: number }[]
}

export function layout(params: Record<string, number>): BistableBeamLayout {
  const { span, apexHeight: h, thickness: t, postLength: p } = params
  const half = t / 2
  const innerX = p > 0 ? -half - POST_CLEARANCE : 0
  const beamOffset = p > 0 ? Math.max(t + BEAM_GAP, p + LEDGE + half + POST_CLEARANCE) : t + BEAM_GAP
  const shuttleWidth = Math.max(2, 0.1 * span)
  const padWidth = 2 * shuttleWidth
  const shuttleBottom = h - half - SHUTTLE_MARGIN
  const padBottom = h + beamOffset + half + h / 2 + 1
  const padTop = padBottom + PAD_HEIGHT
  const baseTop = Math.min(shuttleBottom - 2 * h - TRAVEL_CLEARANCE, p > 0 ? -p : Infinity)
  const frameBottom = baseTop - FRAME_BASE
  const wallTop = beamOffset + half + WALL_ABOVE_BEAM
  const holeY = frameBottom + FRAME_WALL / 2
  return {
    innerX,
    beamOffset,
    shuttleWidth,
    padWidth,
    shuttleBottom,
    padBottom,
    padTop,
    baseTop,
    frameBottom,
    wallTop,
    holes: [
      { x: innerX - FRAME_WALL / 2, y: holeY, diameter: HOLE_DIAMETER },
      { x: span - innerX + FRAME_WALL / 2, y: holeY, diameter: HOLE_DIAMETER },
    ],
  }
}

/** Outer size: x = span + 2·(frame wall) (+ post clearances), y from the frame foot to the pad top, z = depth. */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  const L = layout(params)
  return {
    x: params.span - 2 * L.innerX + 2 * FRAME_WALL,
    y: Math.max(L.wallTop, L.padTop) - L.frameBottom,
    z: params.depth,
  }
}

export function build(params: Record<string, number>): Geom3 {
  const { span, apexHeight, thickness: t, depth, postLength: p } = params
  const L = layout(params)
  const half = t / 2
  const right = span - L.innerX
  const solids: Geom2[] = [
    box(L.innerX - FRAME_WALL, L.frameBottom, L.innerX, L.wallTop),
    box(right, L.frameBottom, right + FRAME_WALL, L.wallTop),
    box(L.innerX - FRAME_WALL, L.frameBottom, right + FRAME_WALL, L.baseTop),
  ]
  if (p > 0) {
    // lower posts stand on pedestals (or reach into the base bar), upper posts on ledges from the walls
    const pedestal = -p > L.baseTop
    solids.push(polygon(postedBeamPoints({
      span, apexHeight, thickness: t, postLength: p,
      blockBottom: L.baseTop - ANCHOR_OVERLAP,
      blockOuterX: pedestal ? L.innerX - ANCHOR_OVERLAP : -half,
    })))
    solids.push(polygon(postedBeamPoints({
      span, apexHeight, thickness: t, postLength: p, yOffset: L.beamOffset,
      blockBottom: L.beamOffset - p - LEDGE,
      blockOuterX: L.innerX - ANCHOR_OVERLAP,
    })))
  } else {
    // rigid ends reach straight into the walls
    for (const yOffset of [0, L.beamOffset]) {
      solids.push(polygon(cosineBeamPoints({ span, apexHeight, thickness: t, yOffset, extension: FRAME_WALL / 2 })))
    }
  }
  const mid = span / 2
  solids.push(box(mid - L.shuttleWidth / 2, L.shuttleBottom, mid + L.shuttleWidth / 2, L.padTop))
  solids.push(box(mid - L.padWidth / 2, L.padBottom, mid + L.padWidth / 2, L.padTop))
  return extrudeOutline(solids, L.holes.map((c) => hole(c.x, c.y, c.diameter)), depth)
}
