/**
 * Checks of a binary STL, read back from its bytes: the checks a slicer relies on
 * (closed, consistently oriented, positive volume) plus the numbers a test compares.
 * Binary STL layout (the de-facto format): 80-byte header, uint32 triangle count,
 * then 50 bytes per triangle (normal, three vertices as float32, uint16 attribute).
 */

export interface StlTriangle {
  normal: [number, number, number]
  vertices: [[number, number, number], [number, number, number], [number, number, number]]
}

export interface ParsedStl {
  /** Triangle count written in the header field. */
  headerCount: number
  triangles: StlTriangle[]
}

const HEADER_BYTES = 80
const TRIANGLE_BYTES = 50

/** Parses a binary STL; throws when the byte length does not match the header count. */
export function parseBinaryStl(bytes: Uint8Array): ParsedStl {
  if (bytes.byteLength < HEADER_BYTES + 4) {
    throw new Error(`binary STL must be at least ${HEADER_BYTES + 4} bytes, got ${bytes.byteLength}`)
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  const headerCount = view.getUint32(HEADER_BYTES, true)
  const available = Math.floor((bytes.byteLength - HEADER_BYTES - 4) / TRIANGLE_BYTES)
  if (available !== headerCount || (bytes.byteLength - HEADER_BYTES - 4) % TRIANGLE_BYTES !== 0) {
    throw new Error(`binary STL header says ${headerCount} triangles but the body holds ${(bytes.byteLength - HEADER_BYTES - 4) / TRIANGLE_BYTES}`)
  }
  const triangles: StlTriangle[] = new Array(headerCount)
  let offset = HEADER_BYTES + 4
  const f = (at: number) => view.getFloat32(at, true)
  for (let i = 0; i < headerCount; i++) {
    triangles[i] = {
      normal: [f(offset), f(offset + 4), f(offset + 8)],
      vertices: [
        [f(offset + 12), f(offset + 16), f(offset + 20)],
        [f(offset + 24), f(offset + 28), f(offset + 32)],
        [f(offset + 36), f(offset + 40), f(offset + 44)],
      ],
    }
    offset += TRIANGLE_BYTES
  }
  return { headerCount, triangles }
}

export interface EdgeReport {
  /** Distinct undirected edges. */
  edges: number
  /** Undirected edges not used by exactly two triangles (0 for a closed 2-manifold mesh). */
  unpairedEdges: number
  /** Directed edges used more than once or without their reverse (0 when orientation is consistent). */
  orientationErrors: number
  /** Triangles with two equal vertices. */
  degenerateTriangles: number
}

/**
 * Edge manifoldness on exact float32 vertex identity (no welding tolerance: a gap of one
 * float32 step is a hole a slicer would see too).
 */
export function checkEdges(triangles: readonly StlTriangle[]): EdgeReport {
  const vertexIds = new Map<string, number>()
  const idOf = (v: readonly number[]) => {
    const key = `${v[0]},${v[1]},${v[2]}`
    let id = vertexIds.get(key)
    if (id === undefined) {
      id = vertexIds.size
      vertexIds.set(key, id)
    }
    return id
  }
  const undirected = new Map<string, number>()
  const directed = new Map<string, number>()
  let degenerateTriangles = 0
  for (const tri of triangles) {
    const ids = tri.vertices.map(idOf)
    if (ids[0] === ids[1] || ids[1] === ids[2] || ids[0] === ids[2]) degenerateTriangles++
    for (let k = 0; k < 3; k++) {
      const a = ids[k]
      const b = ids[(k + 1) % 3]
      const u = a < b ? `${a}:${b}` : `${b}:${a}`
      undirected.set(u, (undirected.get(u) ?? 0) + 1)
      const d = `${a}>${b}`
      directed.set(d, (directed.get(d) ?? 0) + 1)
    }
  }
  let unpairedEdges = 0
  for (const count of undirected.values()) if (count !== 2) unpairedEdges++
  let orientationErrors = 0
  for (const [key, count] of directed) {
    const [a, b] = key.split('>')
    if (count !== 1 || directed.get(`${b}>${a}`) !== 1) orientationErrors++
  }
  return { edges: undirected.size, unpairedEdges, orientationErrors, degenerateTriangles }
}

/** Enclosed volume (mm³) by the divergence theorem; positive for outward-facing triangles. */
export function signedVolume(triangles: readonly StlTriangle[]): number {
  let sum = 0
  for (const { vertices: [a, b, c] } of triangles) {
    sum += a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) + a[2] * (b[0] * c[1] - b[1] * c[0])
  }
  return sum / 6
}

/** Total triangle area (mm²). */
function surfaceArea(triangles: readonly StlTriangle[]): number {
  let sum = 0
  for (const { vertices: [a, b, c] } of triangles) {
    const u = [b[0] - a[0], b[1] - a[1], b[2] - a[2]]
    const v = [c[0] - a[0], c[1] - a[1], c[2] - a[2]]
    sum += Math.hypot(u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]) / 2
  }
  return sum
}

export interface BoundingBox {
  min: [number, number, number]
  max: [number, number, number]
  size: [number, number, number]
}

export function boundingBox(triangles: readonly StlTriangle[]): BoundingBox {
  const min: [number, number, number] = [Infinity, Infinity, Infinity]
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity]
  for (const tri of triangles) {
    for (const v of tri.vertices) {
      for (let k = 0; k < 3; k++) {
        if (v[k] < min[k]) min[k] = v[k]
        if (v[k] > max[k]) max[k] = v[k]
      }
    }
  }
  return { min, max, size: [max[0] - min[0], max[1] - min[1], max[2] - min[2]] }
}

export interface MeshReport extends EdgeReport {
  headerCount: number
  triangleCount: number
  volume: number
  surfaceArea: number
  box: BoundingBox
}

/** All checks of one binary STL in one pass over the parsed triangles. */
export function checkStl(bytes: Uint8Array): MeshReport {
  const { headerCount, triangles } = parseBinaryStl(bytes)
  return {
    headerCount,
    triangleCount: triangles.length,
    ...checkEdges(triangles),
    volume: signedVolume(triangles),
    surfaceArea: surfaceArea(triangles),
    box: boundingBox(triangles),
  }
}
