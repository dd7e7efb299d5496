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
 * for byte what the package writes (a test holds the two equal for every family), from the
 * snapped mesh the 3MF, DXF and SVG read too (snappedMesh, kept per solid). Any other solid
 * (a polygon of more than three vertices, a triangle that snapping would flatten, an unpaired
 * edge) goes through the package serializer.
 */
export function serializeStl(solid: unknown): Uint8Array {
  const mesh = snappedMesh(solid)
  return mesh ? writeTriangles(mesh) : packageStl(solid)
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

/**
 * A solid's triangles as the package's generalize pass (snap, T-junctions, triangulate) would
 * leave them when that pass changes nothing but the snap: each vertex once, in the order the
 * triangles first name it, at its snapped coordinates.
 */
export interface SnappedMesh {
  /** x, y, z per vertex, mm, snapped to the solid's epsilon. Shared: not to be changed. */
  readonly vertices: readonly number[]
  /** Three vertex indices per triangle, in the solid's own order and winding. */
  readonly triangles: Int32Array
  /**
   * Unit normal per triangle (x, y, z), as JSCAD's poly3.plane gives it for the snapped
   * corners: worked out once for the area check and written by the STL as it is.
   */
  readonly normals: Float64Array
}

/**
 * Snapped meshes of the solids written lately, by the solid itself (JSCAD solids are immutable,
 * so one solid has one mesh): the STL, 3MF, DXF and SVG of a part read the same mesh, and a
 * solid the cache of built solids lets go is let go here too.
 */
const meshes = new WeakMap<object, SnappedMesh | null>()

/**
 * The solid's snapped mesh (see SnappedMesh), or null where the package would do more: a
 * polygon that is not a triangle, one whose snapped area falls to the package's limit
 * (ε²·√3/4) and would be dropped, or an edge not met by its reverse exactly once (a closed
 * mesh without T-junctions is one where every directed edge is, and there the package's
 * T-junction pass inserts nothing).
 */
export function snappedMesh(solid: unknown): SnappedMesh | null {
  if (typeof solid !== 'object' || solid === null || !geometries.geom3.isA(solid as Geom3)) return null
  if (meshes.has(solid)) return meshes.get(solid)!
  const mesh = buildSnappedMesh(solid as Geom3)
  meshes.set(solid, mesh)
  return mesh
}

function buildSnappedMesh(solid: Geom3): SnappedMesh | null {
  const epsilon = jscad.measurements.measureEpsilon(solid)
  const polygons = geometries.geom3.toPolygons(solid)
  if (!(epsilon > 0) || polygons.length === 0) return null
  const minArea = (epsilon * epsilon * Math.sqrt(3)) / 4
  const [low, high] = jscad.measurements.measureBoundingBox(solid) as [number[], number[]]
  // a vertex is keyed by its grid steps from the box's low corner in mixed radix, one radix
  // per axis: the three sides sum to 3 × 10⁵ steps (measureEpsilon), so the product of the
  // radices stays near 10¹⁵, exact in a double, and no key is a string
  const base = low.map((v) => Math.round(v / epsilon) - 1)
  const radix = high.map((v, k) => Math.round(v / epsilon) - base[k] + 2)
  const ids = new Map<number, number>()
  const vertices: number[] = []
  const triangles = new Int32Array(3 * polygons.length)
  const normals = new Float64Array(3 * polygons.length)
  const corner: Vertex[] = [[0, 0, 0], [0, 0, 0], [0, 0, 0]]
  for (let t = 0; t < polygons.length; t++) {
    const p = polygons[t]
    if (p.vertices.length !== 3) return null
    for (let k = 0; k < 3; k++) {
      const v = p.vertices[k]
      const ix = Math.round(v[0] / epsilon), iy = Math.round(v[1] / epsilon), iz = Math.round(v[2] / epsilon)
      const key = ((ix - base[0]) * radix[1] + (iy - base[1])) * radix[2] + (iz - base[2])
      let id = ids.get(key)
      if (id === undefined) {
        id = ids.size
        ids.set(key, id)
        // as vec3.snap writes them (the + 0 turns −0 into 0)
        vertices.push(ix * epsilon + 0, iy * epsilon + 0, iz * epsilon + 0)
      }
      triangles[3 * t + k] = id
      corner[k] = [vertices[3 * id], vertices[3 * id + 1], vertices[3 * id + 2]]
    }
    const snapped = geometries.poly3.create(corner)
    if (!(Math.abs(geometries.poly3.measureArea(snapped)) > minArea)) return null
    // the plane measureArea has just computed (poly3.plane keeps it on the polygon)
    const normal = geometries.poly3.plane(snapped)
    normals[3 * t] = normal[0]; normals[3 * t + 1] = normal[1]; normals[3 * t + 2] = normal[2]
  }
  return edgesPaired(triangles, ids.size) ? { vertices, triangles, normals } : null
}

/**
 * Whether every directed edge of the triangles meets its reverse exactly once: a closed mesh
 * without T-junctions (a vertex lying on another triangle's edge leaves that edge unpaired),
 * where the package's T-junction pass inserts nothing.
 */
function edgesPaired(triangles: Int32Array, vertexCount: number): boolean {
  const open = new Map<number, number>()
  for (let t = 0; t < triangles.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[t + k], b = triangles[t + ((k + 1) % 3)]
      // a directed edge counts +1, its reverse −1, keyed by the unordered pair
      const key = a < b ? a * vertexCount + b : b * vertexCount + a
      const count = (open.get(key) ?? 0) + (a < b ? 1 : -1)
      if (count === 0) open.delete(key)
      else open.set(key, count)
    }
  }
  return open.size === 0
}

type Vertex = [number, number, number]

function writeTriangles({ vertices, triangles, normals }: SnappedMesh): Uint8Array {
  const count = triangles.length / 3
  const out = new Uint8Array(84 + 50 * count)
  out.fill(65, 0, 80)
  const view = new DataView(out.buffer)
  view.setUint32(80, count, true)
  let at = 84
  for (let t = 0; t < triangles.length; t += 3) {
    view.setFloat32(at, normals[t], true)
    view.setFloat32(at + 4, normals[t + 1], true)
    view.setFloat32(at + 8, normals[t + 2], true)
    at += 12
    for (let k = 0; k < 3; k++) {
      const i = 3 * triangles[t + k]
      view.setFloat32(at, vertices[i], true)
      view.setFloat32(at + 4, vertices[i + 1], true)
      view.setFloat32(at + 8, vertices[i + 2], true)
      at += 12
    }
    view.setUint16(at, 0, true)
    at += 2
  }
  return out
}
