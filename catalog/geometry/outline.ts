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

export interface PostAnchor {
  /** Length of each vertical post from the top of its block to the beam centreline (mm). */
  postLength: number
  /** Bottom of the rigid block under each post (mm, absolute y). */
  blockBottom: number
  /** x of the block's outer end on the left (mirrored about mid-span on the right); −thickness/2 for no block. */
  blockOuterX: number
}

/**
 * Outline of a cosine beam carried by two vertical posts standing on rigid blocks, as one
 * simple polygon: written in one piece, the post faces meet the beam surfaces without the
 * collinear overlaps a boolean union of rectangles would have to resolve. The posts are
 * `thickness` wide and centred on the beam ends; a block reaches from blockOuterX to the
 * post's inner face.
 */
export function postedBeamPoints(options: CosineBeamOptions & PostAnchor): Point[] {
  const { span, apexHeight, thickness, yOffset = 0, segments = BEAM_SEGMENTS, postLength, blockBottom, blockOuterX } = options
  const half = thickness / 2
  const offsetPoint = (x: number, side: 1 | -1): Point => {
    const { y, slope } = cosineCentreline(x, span, apexHeight)
    const norm = Math.hypot(1, slope)
    return [x - (side * half * slope) / norm, yOffset + y + (side * half) / norm]
  }
  // where the lower surface meets the post's inner face x = half (bisection on the centreline x)
  let lo = 0
  let hi = 2 * half
  for (let i = 0; i < 60; i++) {
    const m = (lo + hi) / 2
    if (offsetPoint(m, -1)[0] < half) lo = m
    else hi = m
  }
  const footLeft = offsetPoint((lo + hi) / 2, -1)
  const postTop = yOffset - postLength
  const points: Point[] = [[blockOuterX, blockBottom], [half, blockBottom], [half, footLeft[1]]]
  for (let i = 1; i < segments; i++) {
    const p = offsetPoint((span * i) / segments, -1)
    if (p[0] > half && p[0] < span - half) points.push(p)
  }
  points.push(
    [span - half, footLeft[1]],
    [span - half, blockBottom],
    [span - blockOuterX, blockBottom],
    [span - blockOuterX, postTop],
    [span + half, postTop],
    [span + half, yOffset + half],
  )
  for (let i = segments; i >= 0; i--) points.push(offsetPoint((span * i) / segments, 1))
  points.push([-half, yOffset + half], [-half, postTop], [blockOuterX, postTop])
  // without a block the corner points repeat; a polygon must not
  return points.filter((p, i) => {
    const next = points[(i + 1) % points.length]
    return p[0] !== next[0] || p[1] !== next[1]
  })
}

/** JSCAD's epsilon for a part of this size: 1e-5 × the mean of its box sides (measureEpsilon). */
const EPSILON_PER_SIZE = 1e-5

/** Twice the signed area of the grid triangle (a, b, c); exact for grid indices below 2^26. */
const cross = (a: Point, b: Point, c: Point) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0])

/**
 * Union of the solid parts, minus the holes, extruded along +z from z = 0 by `height`.
 *
 * The STL serializer snaps every vertex to a grid of JSCAD's epsilon and drops triangles
 * that snapping flattens, which opens the mesh where three outline points were nearly in
 * line (a gently curved beam, a shallow hook face). So the outline is put on that very grid
 * first and exactly collinear points are dropped: a triangle of grid points is then either
 * flat (never made, since earcut clips no flat ears) or at least epsilon²/2 in area (Pick's
 * theorem), above the serializer's limit of epsilon²·√3/4, and the serializer's own snap
 * moves nothing. The height is rounded so that the part's box reproduces the same epsilon:
 * its sides in grid steps sum to 3/EPSILON_PER_SIZE. Vertices move by at most epsilon/2
 * (about 3e-4 mm on a 60 mm part) and the height by at most 2 epsilon.
 */
export function extrudeOutline(solids: Geom2[], holes: Geom2[], height: number): Geom3 {
  let outline = solids.length === 1 ? solids[0] : booleans.union(solids)
  if (holes.length > 0) outline = booleans.subtract(outline, holes)
  const loops = geometries.geom2.toOutlines(outline) as Point[][]
  if (loops.length === 0) throw new Error('the outline is empty')
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity
  for (const loop of loops) {
    for (const [x, y] of loop) {
      minX = Math.min(minX, x); maxX = Math.max(maxX, x)
      minY = Math.min(minY, y); maxY = Math.max(maxY, y)
    }
  }
  const steps = 3 / EPSILON_PER_SIZE
  const epsilon = (maxX - minX + (maxY - minY) + height) / steps
  const gridLoops: Point[][] = []
  for (const loop of loops) {
    const snapped: Point[] = []
    for (const [x, y] of loop) {
      const p: Point = [Math.round(x / epsilon), Math.round(y / epsilon)]
      const last = snapped[snapped.length - 1]
      if (!last || last[0] !== p[0] || last[1] !== p[1]) snapped.push(p)
    }
    if (snapped.length > 1 && snapped[0][0] === snapped[snapped.length - 1][0] && snapped[0][1] === snapped[snapped.length - 1][1]) snapped.pop()
    // drop points exactly in line with their neighbours until none is left
    let changed = true
    while (changed && snapped.length >= 3) {
      changed = false
      for (let i = 0; i < snapped.length && snapped.length >= 3; i++) {
        const prev = snapped[(i + snapped.length - 1) % snapped.length]
        const next = snapped[(i + 1) % snapped.length]
        if (cross(prev, snapped[i], next) === 0) {
          snapped.splice(i, 1)
          changed = true
          i--
        }
      }
    }
    if (snapped.length >= 3) gridLoops.push(snapped)
  }
  let gx0 = Infinity, gy0 = Infinity, gx1 = -Infinity, gy1 = -Infinity
  for (const loop of gridLoops) {
    for (const [x, y] of loop) {
      gx0 = Math.min(gx0, x); gx1 = Math.max(gx1, x)
      gy0 = Math.min(gy0, y); gy1 = Math.max(gy1, y)
    }
  }
  const heightSteps = steps - (gx1 - gx0) - (gy1 - gy0)
  const sides: [Point, Point][] = []
  for (const loop of gridLoops) {
    for (let i = 0; i < loop.length; i++) {
      const a = loop[i]
      const b = loop[(i + 1) % loop.length]
      sides.push([[a[0] * epsilon, a[1] * epsilon], [b[0] * epsilon, b[1] * epsilon]])
    }
  }
  return extrusions.extrudeLinear({ height: heightSteps * epsilon }, geometries.geom2.create(sides))
}
