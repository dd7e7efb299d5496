/**
 * Printable solid of the meander spring: `spans` straight beams across the axis (along y,
 * centred on y = 0, `spanLength` between connector centrelines) at x = i·pitch, joined at
 * alternate ends by connectors `pitch` long, and a pad with a mounting hole at each free end.
 * Outline in the bending plane (xy), extruded along z by `depth` (common practice).
 *
 * The first span's lower end and the last span's free end (upper for an odd count, lower for
 * an even one) stand on the pads' faces at y = ∓spanLength/2, so every span bends over its
 * full `spanLength`, as the Castigliano model assumes. Pads: PAD_SIZE = 8 square (fixed),
 * reaching outwards from the spring, one M3 clearance hole (3.2) in the centre of each.
 */
import type { Geom2, Geom3 } from '@jscad/modeling/src/geometries/types'
import { box, extrudeOutline, hole } from '../../geometry/outline'

export const PAD_SIZE = 8
export const HOLE_DIAMETER = 3.2

export function layout(params: Record<string, number>) {
  const { spans: n, spanLength: b, pitch: a, thickness: t } = params
  const half = t / 2
  const lastX = (n - 1) * a
  const lastAtTop = n % 2 === 1
  const pads = [
    { x0: half - PAD_SIZE, y0: -b / 2 - PAD_SIZE },
    { x0: lastX - half, y0: lastAtTop ? b / 2 : -b / 2 - PAD_SIZE },
  ]
  return {
    pads,
    holes: pads.map((p) => ({ x: p.x0 + PAD_SIZE / 2, y: p.y0 + PAD_SIZE / 2, diameter: HOLE_DIAMETER })),
  }
}

/**
 * Outer size: x = (spans − 1)·pitch + 2·PAD_SIZE − thickness; y = spanLength + 2·PAD_SIZE for an
 * odd count (pads on opposite sides), spanLength + PAD_SIZE + thickness/2 for an even one; z = depth.
 */
export function envelope(params: Record<string, number>): { x: number; y: number; z: number } {
  const { spans: n, spanLength: b, pitch: a, thickness: t, depth } = params
  return {
    x: (n - 1) * a + 2 * PAD_SIZE - t,
    y: n % 2 === 1 ? b + 2 * PAD_SIZE : b + PAD_SIZE + t / 2,
    z: depth,
  }
}

export function build(params: Record<string, number>): Geom3 {
  const { spans: n, spanLength: b, pitch: a, thickness: t, depth } = params
  if (!Number.isInteger(n) || n < 1) throw new Error(`spans must be a whole number of at least 1, got ${n}`)
  const half = t / 2
  const L = layout(params)
  const solids: Geom2[] = []
  for (let i = 0; i < n; i++) solids.push(box(i * a - half, -b / 2 - half, i * a + half, b / 2 + half))
  for (let i = 0; i < n - 1; i++) {
    const yc = i % 2 === 0 ? b / 2 : -b / 2
    solids.push(box(i * a, yc - half, (i + 1) * a, yc + half))
  }
  for (const p of L.pads) solids.push(box(p.x0, p.y0, p.x0 + PAD_SIZE, p.y0 + PAD_SIZE))
  return extrudeOutline(solids, L.holes.map((c) => hole(c.x, c.y, c.diameter)), depth)
}
