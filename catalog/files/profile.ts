/**
 * The planar profile of a module: every family's solid is one outline in the bending plane
 * (xy) extruded along +z from z = 0 (geometry/outline.ts extrudeOutline), so the outline is
 * read back from the solid's bottom face. Taking it from the built solid, not from a second
 * drawing of the outline, keeps the DXF and SVG exactly the part the STL and 3MF describe.
 */
import { indexedMesh } from './mesh'

type Point = [number, number]

export interface Profile {
  /** Closed loops in mm; the outer boundaries counter-clockwise, holes clockwise. */
  loops: Point[][]
  /** Extrusion depth along z, mm. */
  depth: number
  /** Bounding box of the loops, mm. */
  box: { minX: number; minY: number; maxX: number; maxY: number }
}

/** Signed area of a closed loop (shoelace formula), positive counter-clockwise. */
function loopArea(loop: readonly Point[]): number {
  let sum = 0
  for (let i = 0; i < loop.length; i++) {
    const [x0, y0] = loop[i]
    const [x1, y1] = loop[(i + 1) % loop.length]
    sum += x0 * y1 - x1 * y0
  }
  return sum / 2
}

/** Profiles of the solids written lately, by the solid (immutable in JSCAD): a part's DXF and SVG share one. */
const profiles = new WeakMap<object, Profile>()

/** The solid's profile; the same object for the same solid, so not to be changed. */
export function profileOf(solid: unknown): Profile {
  const held = typeof solid === 'object' && solid !== null ? profiles.get(solid) : undefined
  if (held) return held
  const profile = readProfile(solid)
  if (typeof solid === 'object' && solid !== null) profiles.set(solid, profile)
  return profile
}

function readProfile(solid: unknown): Profile {
  const { vertices, triangles } = indexedMesh(solid)
  let minZ = Infinity
  let maxZ = -Infinity
  for (let i = 2; i < vertices.length; i += 3) {
    minZ = Math.min(minZ, vertices[i])
    maxZ = Math.max(maxZ, vertices[i])
  }
  if (!Number.isFinite(minZ)) throw new Error('the solid has no faces')
  // triangles of the bottom cap (every corner at the lowest z): seen from outside (below) they
  // run clockwise in xy, so their edges reversed run counter-clockwise around the material
  const directed = new Map<string, number>()
  const bottom: number[] = []
  for (let t = 0; t < triangles.length; t += 3) {
    const c = [triangles[t], triangles[t + 1], triangles[t + 2]]
    if (c.every((v) => vertices[3 * v + 2] === minZ)) bottom.push(c[0], c[1], c[2])
  }
  for (let t = 0; t < bottom.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = bottom[t + k]
      const b = bottom[t + ((k + 1) % 3)]
      directed.set(`${b}>${a}`, (directed.get(`${b}>${a}`) ?? 0) + 1)
    }
  }
  // boundary edges: those whose reverse is not an edge of the cap too
  const next = new Map<number, number>()
  for (const key of directed.keys()) {
    const [a, b] = key.split('>').map(Number)
    if (!directed.has(`${b}>${a}`)) {
      if (next.has(a)) throw new Error('the bottom face of the solid is not a simple outline')
      next.set(a, b)
    }
  }
  const loops: Point[][] = []
  const used = new Set<number>()
  for (const start of next.keys()) {
    if (used.has(start)) continue
    const loop: Point[] = []
    let at = start
    while (!used.has(at)) {
      used.add(at)
      loop.push([vertices[3 * at], vertices[3 * at + 1]])
      const to = next.get(at)
      if (to === undefined) throw new Error('the outline of the solid does not close')
      at = to
    }
    if (at !== start) throw new Error('the outline of the solid does not close')
    loops.push(dropCollinear(loop))
  }
  if (!loops.length) throw new Error('the solid has no bottom face')
  // outer boundaries first (largest area), then holes
  loops.sort((a, b) => loopArea(b) - loopArea(a))
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity
  for (const loop of loops) for (const [x, y] of loop) {
    minX = Math.min(minX, x); maxX = Math.max(maxX, x)
    minY = Math.min(minY, y); maxY = Math.max(maxY, y)
  }
  return { loops, depth: maxZ - minZ, box: { minX, minY, maxX, maxY } }
}

/** Removes points exactly on the line through their neighbours (a cap's triangulation adds none, but side walls may split an edge). */
function dropCollinear(loop: Point[]): Point[] {
  const out = loop.filter((p, i) => {
    const a = loop[(i + loop.length - 1) % loop.length]
    const b = loop[(i + 1) % loop.length]
    return (p[0] - a[0]) * (b[1] - a[1]) - (p[1] - a[1]) * (b[0] - a[0]) !== 0
  })
  return out.length >= 3 ? out : loop
}
