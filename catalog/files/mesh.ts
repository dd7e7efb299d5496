/**
 * The triangle mesh of a solid with shared vertices: the triangulation the STL writer makes
 * (JSCAD's generalize with snap and triangulate), with equal corners merged into one vertex.
 * A slicer reading a shared-vertex mesh (3MF) sees the same surface as the STL's triangles.
 */
import jscad from '@jscad/modeling'
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { snappedMesh } from '../geometry/stl'

const { geometries, modifiers } = jscad
// the package's .d.ts re-exports generalize as a module namespace; at run time it is the function
const generalize = modifiers.generalize as unknown as (options: { snap: boolean; triangulate: boolean }, solid: Geom3) => Geom3

export interface IndexedMesh {
  /** x, y, z per vertex, mm. Shared by every reader of the solid: not to be changed. */
  readonly vertices: readonly number[]
  /** Three vertex indices per triangle, counter-clockwise seen from outside. */
  readonly triangles: ArrayLike<number>
}

/**
 * Meshes of the solids written lately, by the solid (immutable in JSCAD): the 3MF, DXF and
 * SVG of one part share one.
 */
const meshes = new WeakMap<object, IndexedMesh>()

export function indexedMesh(solid: unknown): IndexedMesh {
  const held = typeof solid === 'object' && solid !== null ? meshes.get(solid) : undefined
  if (held) return held
  // the catalog's solids: already the triangles generalize would leave, on its grid, closed
  const mesh = snappedMesh(solid) ?? generalizedMesh(solid)
  if (typeof solid === 'object' && solid !== null) meshes.set(solid, mesh)
  return mesh
}

function generalizedMesh(solid: unknown): IndexedMesh {
  const triangulated = generalize({ snap: true, triangulate: true }, solid as Geom3)
  const ids = new Map<string, number>()
  const vertices: number[] = []
  const triangles: number[] = []
  const idOf = (v: readonly number[]) => {
    const key = `${v[0]},${v[1]},${v[2]}`
    let id = ids.get(key)
    if (id === undefined) {
      id = ids.size
      ids.set(key, id)
      vertices.push(v[0], v[1], v[2])
    }
    return id
  }
  for (const polygon of geometries.geom3.toPolygons(triangulated)) {
    const corner = polygon.vertices.map(idOf)
    // generalize leaves triangles; a polygon with more corners is fanned as the STL writer does
    for (let i = 1; i + 1 < corner.length; i++) {
      const a = corner[0], b = corner[i], c = corner[i + 1]
      if (a === b || b === c || a === c) continue
      triangles.push(a, b, c)
    }
  }
  return { vertices, triangles }
}
