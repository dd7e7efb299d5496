/**
 * Pure helpers of the 3D preview: JSCAD polygons to a triangle list for a BufferGeometry, its
 * bounding box, and where to put the camera so the whole part is in view. No three.js here,
 * so the numbers are unit-tested without WebGL.
 */
export type Vec3 = [number, number, number]

export interface Box3 {
  min: Vec3
  max: Vec3
}

/** Triangle positions (x, y, z per vertex) of convex planar polygons, fanned from the first vertex. */
export function polygonsToPositions(polygons: ReadonlyArray<{ vertices: ReadonlyArray<ArrayLike<number>> }>): Float32Array {
  let count = 0
  for (const p of polygons) if (p.vertices.length >= 3) count += p.vertices.length - 2
  const out = new Float32Array(count * 9)
  let k = 0
  for (const p of polygons) {
    const v = p.vertices
    for (let i = 1; i + 1 < v.length; i++) {
      for (const q of [v[0], v[i], v[i + 1]]) {
        out[k++] = q[0]
        out[k++] = q[1]
        out[k++] = q[2]
      }
    }
  }
  return out
}

export function boundingBox(positions: ArrayLike<number>): Box3 | null {
  if (positions.length < 3) return null
  const min: Vec3 = [Infinity, Infinity, Infinity]
  const max: Vec3 = [-Infinity, -Infinity, -Infinity]
  for (let i = 0; i + 2 < positions.length; i += 3) {
    for (let a = 0; a < 3; a++) {
      const v = positions[i + a]
      if (v < min[a]) min[a] = v
      if (v > max[a]) max[a] = v
    }
  }
  return { min, max }
}

export interface CameraFit {
  target: Vec3
  position: Vec3
  /** Radius of the box's bounding sphere, mm. */
  radius: number
  distance: number
  near: number
  far: number
}

/** Looking down on the build plate from the front right: the part lies in XY, its depth along Z. */
export const VIEW_DIRECTION: Vec3 = [0.55, -0.85, 1.05]

/**
 * A perspective camera (vertical field of view `fovDeg`, width/height `aspect`) placed along
 * `direction` from the box centre, far enough that the box's bounding sphere fits the
 * narrower of the two fields of view, with `padding` (1.15 = 15 % room around the part).
 */
export function fitCamera(box: Box3, fovDeg: number, aspect: number, padding = 1.15, direction: Vec3 = VIEW_DIRECTION): CameraFit {
  const target: Vec3 = [0, 1, 2].map((a) => (box.min[a] + box.max[a]) / 2) as Vec3
  const size = [0, 1, 2].map((a) => box.max[a] - box.min[a])
  const radius = Math.max(Math.hypot(size[0], size[1], size[2]) / 2, 1e-6)
  const vHalf = (fovDeg * Math.PI) / 180 / 2
  const hHalf = Math.atan(Math.tan(vHalf) * Math.max(aspect, 1e-6))
  const half = Math.min(vHalf, hHalf)
  const distance = (radius * padding) / Math.sin(half)
  const len = Math.hypot(...direction) || 1
  const position = direction.map((d, a) => target[a] + (d / len) * distance) as Vec3
  return { target, position, radius, distance, near: Math.max(distance - radius * 2, distance / 100), far: distance + radius * 4 }
}
