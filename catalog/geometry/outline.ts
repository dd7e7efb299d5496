/**
 * 2D outlines (in the bending plane, mm) that the families extrude into printable solids.
 * Every solid is one extrusion of one outline, so walls and caps share their vertices
 * and the mesh is closed by construction.
 */
import jscad from '@jscad/modeling'
import type { Geom2, Geom3 } from '@jscad/modeling/src/geometries/types'

const { primitives, booleans, extrusions, geometries } = jscad

export type Point = [number, number]

/** Segments per full circle of a mounting hole: polygon area is (n/2)·sin(2π/n) r², 0.16 % short of πr² at 64. */
export const HOLE_SEGMENTS = 64

/**
 * Segments per cosine beam along the span. A chord of length s on a curve of curvature κ sags
 * κ s²/8 from it: 1.3e-4 mm at span 40, apex height 3 (s = 0.17 mm), a few 1e-4 of the area.
 */
export const BEAM_SEGMENTS = 240

/** Axis-aligned rectangle from its corners (x0 < x1, y0 < y1). */
export function box(x0: number, y0: number, x1: number, y1: number): Geom2 {
  if (!(x1 > x0 && y1 > y0)) throw new Error(`box corners must be ordered: (${x0}, ${y0}) to (${x1}, ${y1})`)
  return primitives.polygon({ points: [[x0, y0], [x1, y0], [x1, y1], [x0, y1]] })
}

/** A closed polygon from counter-clockwise points. */
export function polygon(points: Point[]): Geom2 {
  return primitives.polygon({ points })
}

/** A round hole (to subtract) of diameter `diameter` centred at (x, y). */
export function hole(x: number, y: number, diameter: number): Geom2 {
  return primitives.circle({ radius: diameter / 2, center: [x, y], segments: HOLE_SEGMENTS })
}

/** Area of the HOLE_SEGMENTS-gon that stands for a circle of diameter d (for volume tolerances). */
export function holePolygonArea(diameter: number): number {
  const r = diameter / 2
  return (HOLE_SEGMENTS / 2) * r * r * Math.sin((2 * Math.PI) / HOLE_SEGMENTS)
}

export interface CosineBeamOptions {
  /** Distance between the beam ends along x (mm). */
  span: number
  /** Rise of the centreline at mid-span (mm). */
  apexHeight: number
  /** In-plane thickness, measured normal to the centreline (mm). */
  thickness: number
  /** Vertical offset of the whole beam (mm). */
  yOffset?: number
  /** Straight, tangent extension beyond each end (mm), to anchor the beam inside a frame or post. */
  extension?: number
  segments?: number
}

/** Centreline w0(x) = (h/2)(1 − cos 2πx/l) of Qiu, Lang & Slocum (2004) and its slope. */
export function cosineCentreline(x: number, span: number, apexHeight: number): { y: number; slope: number } {
  const k = (2 * Math.PI) / span
  return { y: (apexHeight / 2) * (1 - Math.cos(k * x)), slope: (apexHeight / 2) * k * Math.sin(k * x) }
}

/**
 * Outline of a cosine beam: the centreline offset by ±thickness/2 along its normal, sampled
 * at `segments` equal steps in x. The slope is zero at both ends, so the straight
 * extensions continue the beam smoothly into whatever holds it.
 */
export function cosineBeamPoints(options: CosineBeamOptions): Point[] {
  const { span, apexHeight, thickness, yOffset = 0, extension = 0, segments = BEAM_SEGMENTS } = options
  const half = thickness / 2
  const lower: Point[] = []
  const upper: Point[] = []
  for (let i = 0; i <= segments; i++) {
    const x = (span * i) / segments
    const { y, slope } = cosineCentreline(x, span, apexHeight)
    const norm = Math.hypot(1, slope)
    // unit normal (−slope, 1)/norm points to the upper (convex at mid-span) side
    const nx = -slope / norm
    const ny = 1 / norm
    lower.push([x - half * nx, yOffset + y - half * ny])
    upper.push([x + half * nx, yOffset + y + half * ny])
  }
  const points: Point[] = []
  if (extension > 0) points.push([-extension, yOffset - half])
  points.push(...lower)
  if (extension > 0) points.push([span + extension, yOffset - half], [span + extension, yOffset + half])
  points.push(...upper.reverse())
  if (extension > 0) points.push([-extension, yOffset + half])
  return points
}

/** Union of the solid parts, minus the holes, extruded along +z by `height` from z = 0. */
export function extrudeOutline(solids: Geom2[], holes: Geom2[], height: number): Geom3 {
  let outline = solids.length === 1 ? solids[0] : booleans.union(solids)
  if (holes.length > 0) outline = booleans.subtract(outline, holes)
  if (geometries.geom2.toSides(outline).length === 0) throw new Error('the outline is empty')
  return extrusions.extrudeLinear({ height }, outline)
}
