/**
 * 2D outlines (in the bending plane, mm) that the families extrude into printable solids.
 * Every solid is one extrusion of one outline, so walls and caps share their vertices
 * and the mesh is closed by construction.
 */
import jscad from '@jscad/modeling'
import type { Geom2, Geom3 } from '@jscad/modeling/src/geometries/types'
import earcut from 'earcut'
import polygonClipping, { type Polygon } from 'polygon-clipping'

const { primitives, geometries } = jscad

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
  return polygon([[x0, y0], [x1, y0], [x1, y1], [x0, y1]])
}

/**
 * The points each shape made here was made from, so that the outline reads them back as they
 * are instead of through JSCAD's toOutlines, which rebuilds every loop from its loose sides
 * (a vertex search per side: 1.6 ms of a bistable frame's two 480-point beams).
 */
const pointsOf = new WeakMap<Geom2, Point[]>()

/** A closed polygon from counter-clockwise points. */
export function polygon(points: Point[]): Geom2 {
  const shape = primitives.polygon({ points })
  pointsOf.set(shape, points)
  return shape
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

/** A geom2's outlines as one clipping polygon (rings closed, as polygon-clipping takes them). */
function clipPolygon(shape: Geom2): Polygon {
  const points = pointsOf.get(shape)
  if (points) return [[...points, points[0]]]
  return (geometries.geom2.toOutlines(shape) as Point[][]).map((ring) => [...ring, ring[0]])
}

type Bounds = [number, number, number, number]

function boundsOf(polygon: Polygon): Bounds {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity
  for (const ring of polygon) for (const [x, y] of ring) {
    if (x < x0) x0 = x
    if (x > x1) x1 = x
    if (y < y0) y0 = y
    if (y > y1) y1 = y
  }
  return [x0, y0, x1, y1]
}

const overlap = (a: Bounds, b: Bounds) => a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3]

/**
 * The outline (union of the solids) − (union of the holes), as polygons: each an outer loop
 * (counter-clockwise) and the loops of its holes (clockwise). Done in the plane by
 * polygon-clipping (a sweep line: Martínez, Rueda & Feito, Computers & Geosciences 35:1177,
 * 2009) rather than by JSCAD's booleans, which turn every 2D shape into a 3D slab and cut BSP
 * trees: less than half the time for a bistable frame with its two 240-segment beams.
 */
function outlinePolygons(solids: Geom2[], holes: Geom2[]): Point[][][] {
  const parts = solids.map(clipPolygon)
  const cuts = holes.map(clipPolygon)
  // (∪S) − (∪H) = ((∪ of the solids a hole's box meets) − ∪H) ∪ (the others), as those others
  // miss every hole: the holes are cut from the few solids around them (a frame's walls), not
  // from the union with its long beams, which the sweep would otherwise pass over twice
  const holeBounds = cuts.map(boundsOf)
  const near: Polygon[] = [], far: Polygon[] = []
  for (const part of parts) {
    const b = boundsOf(part)
    ;(holeBounds.some((h) => overlap(b, h)) ? near : far).push(part)
  }
  const unite = (list: Polygon[]) => (list.length === 1 ? [list[0]] : polygonClipping.union(list[0], ...list.slice(1)))
  let shape: Polygon[] = cuts.length && near.length ? polygonClipping.difference(unite(near), ...cuts) : near.length ? unite(near) : []
  if (far.length) shape = shape.length ? polygonClipping.union(shape, ...far) : unite(far)
  // rings come closed (the first point repeated last)
  return shape.map((polygon) => polygon.map((ring) => {
    const closed = ring.length > 1 && ring[0][0] === ring[ring.length - 1][0] && ring[0][1] === ring[ring.length - 1][1]
    return (closed ? ring.slice(0, -1) : ring) as Point[]
  }))
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
  const polygons = outlinePolygons(solids, holes)
  if (polygons.length === 0) throw new Error('the outline is empty')
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity
  for (const polygon of polygons) {
    for (const [x, y] of polygon[0]) {
      minX = Math.min(minX, x); maxX = Math.max(maxX, x)
      minY = Math.min(minY, y); maxY = Math.max(maxY, y)
    }
  }
  const steps = 3 / EPSILON_PER_SIZE
  const epsilon = (maxX - minX + (maxY - minY) + height) / steps
  const gridPolygons: Point[][][] = []
  for (const polygon of polygons) {
    const rings = polygon.map(snapLoop(epsilon))
    // an outer loop that snapping collapses takes its holes with it
    if (rings[0].length < 3) continue
    gridPolygons.push(rings.filter((ring) => ring.length >= 3))
  }
  let gx0 = Infinity, gy0 = Infinity, gx1 = -Infinity, gy1 = -Infinity
  for (const polygon of gridPolygons) {
    for (const [x, y] of polygon[0]) {
      gx0 = Math.min(gx0, x); gx1 = Math.max(gx1, x)
      gy0 = Math.min(gy0, y); gy1 = Math.max(gy1, y)
    }
  }
  const heightSteps = steps - (gx1 - gx0) - (gy1 - gy0)
  return extrudeGrid(gridPolygons, epsilon, heightSteps)
}

/** A loop put on the grid of `epsilon` (integer points), repeats and exactly collinear points dropped. */
function snapLoop(epsilon: number): (loop: Point[]) => Point[] {
  return (loop) => {
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
      const kept: Point[] = []
      for (let i = 0; i < snapped.length; i++) {
        const prev = kept.length ? kept[kept.length - 1] : snapped[snapped.length - 1]
        const next = snapped[(i + 1) % snapped.length]
        if (cross(prev, snapped[i], next) === 0) changed = true
        else kept.push(snapped[i])
      }
      snapped.length = 0
      snapped.push(...kept)
    }
    return snapped
  }
}

/**
 * The prism of grid polygons from z = 0 to heightSteps: each cap triangulated by earcut
 * (Mapbox's ear clipping with hole bridges; on grid points it clips no flat ear), one
 * rectangle of two triangles per outline edge for the walls, every triangle wound
 * counter-clockwise seen from outside. Cap and wall share the outline's vertices edge for
 * edge, so the mesh is closed by construction; built here rather than by JSCAD's
 * extrudeLinear, which rebuilds the outline from loose sides first (the larger part of its
 * time on long outlines), and already in triangles, which the STL writer then needs as they are.
 */
function extrudeGrid(polygons: Point[][][], epsilon: number, heightSteps: number): Geom3 {
  const top = heightSteps * epsilon
  const triangles: Array<ReturnType<typeof geometries.poly3.create>> = []
  for (const rings of polygons) {
    const flat: number[] = []
    const holeStarts: number[] = []
    for (let r = 0; r < rings.length; r++) {
      if (r > 0) holeStarts.push(flat.length / 2)
      for (const [x, y] of rings[r]) flat.push(x, y)
    }
    // each outline point's two corners, shared by the caps' and the walls' triangles (JSCAD
    // never changes a vertex in place), rather than new arrays for every triangle that meets there
    const low: Vertex[] = [], high: Vertex[] = []
    for (let n = 0; n < flat.length; n += 2) {
      const x = flat[n] * epsilon, y = flat[n + 1] * epsilon
      low.push([x, y, 0])
      high.push([x, y, top])
    }
    const indices = conformCap(flat, rings, earcut(flat, holeStarts.length ? holeStarts : null))
    for (let k = 0; k < indices.length; k += 3) {
      let i = indices[k], j = indices[k + 1]
      const l = indices[k + 2]
      // wound counter-clockwise in the plane for the top cap
      if ((flat[2 * j] - flat[2 * i]) * (flat[2 * l + 1] - flat[2 * i + 1]) - (flat[2 * j + 1] - flat[2 * i + 1]) * (flat[2 * l] - flat[2 * i]) < 0) [i, j] = [j, i]
      triangles.push(geometries.poly3.create([high[i], high[j], high[l]]), geometries.poly3.create([low[i], low[l], low[j]]))
    }
    let start = 0
    for (let r = 0; r < rings.length; r++) {
      // outer loops run counter-clockwise and holes clockwise: the material is on the left
      const length = rings[r].length
      const forward = Math.sign(twiceArea(rings[r])) === (r === 0 ? 1 : -1)
      // the ring's k-th point in that sense, as an index into flat (orient() without the copy)
      const at = (k: number) => start + (forward ? k : length - 1 - k)
      for (let k = 0; k < length; k++) {
        const a = at(k), b = at((k + 1) % length)
        triangles.push(geometries.poly3.create([low[a], low[b], high[b]]), geometries.poly3.create([low[a], high[b], high[a]]))
      }
      start += length
    }
  }
  return geometries.geom3.create(triangles)
}

type Vertex = [number, number, number]

/**
 * Removes the T-junctions of a cap's triangulation: where a hole touches the outer loop or
 * another hole in line with a bridge (a mounting hole whose leftmost point lies level with a
 * corner of the window), earcut can leave one triangle's edge running past a vertex of its
 * neighbours, which opens the mesh there. Such an edge is split at the vertex, found among the
 * ends of the other unmatched edges, until every edge of the cap is matched by its reverse or
 * by the outline (whose walls match it). Exact on the integer grid; the few unmatched edges
 * are all it looks at. Returns the triangle indices (points appended to `flat` are none: every
 * split point is a vertex of the outline).
 */
function conformCap(flat: number[], rings: Point[][], indices: number[]): number[] {
  // edges are keyed by the vertices' coordinates, not their indices: where the outline touches
  // itself one grid point stands at two indices. Each point gets one id, keyed by the number
  // x·2^21 + y of its grid steps from the cap's lowest corner (fewer than the 3/EPSILON_PER_SIZE
  // steps of the part's box sides, below 2^21), so no key is a string.
  let x0 = Infinity, y0 = Infinity
  for (let n = 0; n < flat.length; n += 2) { x0 = Math.min(x0, flat[n]); y0 = Math.min(y0, flat[n + 1]) }
  const ids = new Map<number, number>()
  const idAt = new Int32Array(flat.length / 2)
  for (let n = 0; n < idAt.length; n++) {
    const k = (flat[2 * n] - x0) * GRID_SPAN + (flat[2 * n + 1] - y0)
    let id = ids.get(k)
    if (id === undefined) { id = ids.size; ids.set(k, id) }
    idAt[n] = id
  }
  const pointId = (p: Point) => ids.get((p[0] - x0) * GRID_SPAN + (p[1] - y0))!
  // an edge between point ids: below 2^30 for caps of up to 2^15 points, so a small integer
  // the Set hashes directly (a larger base made every key a heap number)
  const count = ids.size
  const edge = (a: number, b: number) => a * count + b
  const tris = [...indices]
  // the outline's edges, the way the walls match them: outer loops clockwise, holes counter-clockwise as seen by the cap
  const boundary: number[] = []
  for (let r = 0; r < rings.length; r++) {
    const ring = orient(rings[r], r === 0 ? 1 : -1)
    for (let k = 0; k < ring.length; k++) boundary.push(edge(pointId(ring[(k + 1) % ring.length]), pointId(ring[k])))
  }
  const corners = new Int32Array(3)
  for (let pass = 0; pass < 16; pass++) {
    // every directed edge of the cap, the walls' partners of the outline included: a triangle's
    // edge a→b is matched when b→a is among them, by a neighbour or by the wall
    const present = new Set<number>(boundary)
    for (let t = 0; t < tris.length; t += 3) {
      // counter-clockwise in the plane, as the top cap is written
      ccwInto(corners, flat, tris[t], tris[t + 1], tris[t + 2])
      for (let k = 0; k < 3; k++) present.add(edge(idAt[corners[k]], idAt[corners[(k + 1) % 3]]))
    }
    // the unmatched edges, where a T-junction leaves an edge running past a vertex
    const loose: Array<[number, number, number]> = []
    for (let t = 0; t < tris.length; t += 3) {
      ccwInto(corners, flat, tris[t], tris[t + 1], tris[t + 2])
      for (let k = 0; k < 3; k++) {
        const a = corners[k], b = corners[(k + 1) % 3]
        if (!present.has(edge(idAt[b], idAt[a]))) loose.push([t, a, b])
      }
    }
    if (!loose.length) return tris
    // the vertex may be any of the cap's (one where the outline touches itself ends no loose
    // edge), looked at in the order the triangles name them
    const ends = new Set<number>()
    for (let t = 0; t < tris.length; t += 3) {
      ccwInto(corners, flat, tris[t], tris[t + 1], tris[t + 2])
      for (let k = 0; k < 3; k++) { ends.add(corners[k]); ends.add(corners[(k + 1) % 3]) }
    }
    let split = false
    const done = new Set<number>()
    for (const [t, a, b] of loose) {
      if (done.has(t)) continue
      const ax = flat[2 * a], ay = flat[2 * a + 1], bx = flat[2 * b], by = flat[2 * b + 1]
      for (const p of ends) {
        const px = flat[2 * p], py = flat[2 * p + 1]
        const along = (px - ax) * (bx - ax) + (py - ay) * (by - ay)
        if ((bx - ax) * (py - ay) - (by - ay) * (px - ax) !== 0 || along <= 0 || along >= (bx - ax) ** 2 + (by - ay) ** 2) continue
        const [i, j, l] = ccw(flat, tris[t], tris[t + 1], tris[t + 2])
        const c = i !== a && i !== b ? i : j !== a && j !== b ? j : l
        tris.splice(t, 3, a, p, c)
        tris.push(p, b, c)
        done.add(t)
        split = true
        break
      }
    }
    if (!split) return tris
  }
  return tris
}

/** Base in which two grid coordinates (or two point ids) are packed into one exact number. */
const GRID_SPAN = 2 ** 21

/** ccw without the array: the triangle's indices counter-clockwise written into `out`. */
function ccwInto(out: Int32Array, flat: number[], i: number, j: number, l: number): void {
  const twice = (flat[2 * j] - flat[2 * i]) * (flat[2 * l + 1] - flat[2 * i + 1]) - (flat[2 * j + 1] - flat[2 * i + 1]) * (flat[2 * l] - flat[2 * i])
  if (twice < 0) { out[0] = j; out[1] = i } else { out[0] = i; out[1] = j }
  out[2] = l
}

/** The triangle's indices wound counter-clockwise in the plane. */
function ccw(flat: number[], i: number, j: number, l: number): [number, number, number] {
  const twice = (flat[2 * j] - flat[2 * i]) * (flat[2 * l + 1] - flat[2 * i + 1]) - (flat[2 * j + 1] - flat[2 * i + 1]) * (flat[2 * l] - flat[2 * i])
  return twice < 0 ? [j, i, l] : [i, j, l]
}

/** The loop wound counter-clockwise (sense 1) or clockwise (−1). */
function orient(loop: Point[], sense: 1 | -1): Point[] {
  return Math.sign(twiceArea(loop)) === sense ? loop : [...loop].reverse()
}

/** Twice the loop's signed area (positive counter-clockwise). */
function twiceArea(loop: Point[]): number {
  let twice = 0
  for (let k = 0; k < loop.length; k++) {
    const a = loop[k], b = loop[(k + 1) % loop.length]
    twice += a[0] * b[1] - b[0] * a[1]
  }
  return twice
}
