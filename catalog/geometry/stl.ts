import jscad from '@jscad/modeling'
import stlSerializer from '@jscad/stl-serializer'
import type { Geom3 } from '@jscad/modeling/src/geometries/types'

const { geometries } = jscad

/**
 * Binary STL bytes of a JSCAD solid; deterministic for the same solid.
 *
 * The package serializer first generalizes the solid: it snaps every vertex to the solid's
 * epsilon (measureEpsilon), drops the triangles that snapping flattens, inserts vertices at
 * T-junctions and splits polygons into triangles. The solids of this catalog come out of
 * extrudeOutline as triangles on that grid, closed edge for edge, where all but the snap
 * change nothing, yet the T-junction pass alone was more than half the time of an STL
 * (profiled: 30–45 ms of a bistable frame's 3,900 triangles). Such a solid is snapped and
 * written here in the same binary layout (80-byte header of 'A', triangle count, then per
 * triangle the plane normal, three vertices and a zero attribute word, little-endian): byte
 * for byte what the package writes (a test holds the two equal for every family). Any other
 * solid (a polygon of more than three vertices, a triangle that snapping would flatten, an
 * unpaired edge) goes through the package serializer.
 */
export function serializeStl(solid: unknown): Uint8Array {
  if (geometries.geom3.isA(solid as Geom3)) {
    const triangles = snappedTriangles(solid as Geom3)
    if (triangles && edgesPaired(triangles)) return writeTriangles(triangles)
  }
  return packageStl(solid)
}

/** The package serializer's bytes (snap, triangulate, write). */
export function packageStl(solid: unknown): Uint8Array {
  const parts = stlSerializer.serialize({ binary: true }, solid) as ArrayBuffer[]
  const total = parts.reduce((n, p) => n + p.byteLength, 0)
  const out = new Uint8Array(total)
  let offset = 0
  for (const p of parts) {
    out.set(new Uint8Array(p), offset)
    offset += p.byteLength
  }
  return out
}

type Vertex = [number, number, number]

/**
 * The triangles with their vertices snapped as the package snaps them (vec3.snap to
 * measureEpsilon), or null where it would do more: a polygon that is not a triangle, or one
 * whose snapped area falls to its limit (ε²·√3/4) and would be dropped.
 */
function snappedTriangles(solid: Geom3): Vertex[][] | null {
  const epsilon = jscad.measurements.measureEpsilon(solid)
  const minArea = (epsilon * epsilon * Math.sqrt(3)) / 4
  const out: Vertex[][] = []
  for (const p of geometries.geom3.toPolygons(solid)) {
    if (p.vertices.length !== 3) return null
    const t = p.vertices.map((v) => [Math.round(v[0] / epsilon) * epsilon + 0, Math.round(v[1] / epsilon) * epsilon + 0, Math.round(v[2] / epsilon) * epsilon + 0] as Vertex)
    if (!(Math.abs(geometries.poly3.measureArea(geometries.poly3.create(t))) > minArea)) return null
    out.push(t)
  }
  return out
}

/**
 * Whether every directed edge of the triangles meets its reverse exactly once: a closed mesh
 * without T-junctions (a vertex lying on another triangle's edge leaves that edge unpaired),
 * where the package's T-junction pass inserts nothing. Where the outline touches itself
 * (side posts meeting a ledge) it does insert triangles, and the package path is taken.
 */
function edgesPaired(triangles: Vertex[][]): boolean {
  const ids = new Map<string, number>()
  const id = (v: readonly number[]) => {
    const key = `${v[0]},${v[1]},${v[2]}`
    let i = ids.get(key)
    if (i === undefined) { i = ids.size; ids.set(key, i) }
    return i
  }
  const open = new Map<number, number>()
  const tri = new Int32Array(3)
  for (const t of triangles) {
    for (let k = 0; k < 3; k++) tri[k] = id(t[k])
    for (let k = 0; k < 3; k++) {
      const a = tri[k], b = tri[(k + 1) % 3]
      // a directed edge counts +1, its reverse −1, keyed by the unordered pair
      const key = a < b ? a * 2 ** 26 + b : b * 2 ** 26 + a
      const count = (open.get(key) ?? 0) + (a < b ? 1 : -1)
      if (count === 0) open.delete(key)
      else open.set(key, count)
    }
  }
  return open.size === 0
}

function writeTriangles(triangles: Vertex[][]): Uint8Array {
  const out = new Uint8Array(84 + 50 * triangles.length)
  out.fill(65, 0, 80)
  const view = new DataView(out.buffer)
  view.setUint32(80, triangles.length, true)
  let at = 84
  for (const t of triangles) {
    const plane = geometries.poly3.plane(geometries.poly3.create(t))
    view.setFloat32(at, plane[0], true)
    view.setFloat32(at + 4, plane[1], true)
    view.setFloat32(at + 8, plane[2], true)
    at += 12
    for (const v of t) {
      view.setFloat32(at, v[0], true)
      view.setFloat32(at + 4, v[1], true)
      view.setFloat32(at + 8, v[2], true)
      at += 12
    }
    view.setUint16(at, 0, true)
    at += 2
  }
  return out
}
