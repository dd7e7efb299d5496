import { describe, expect, it } from 'vitest'
import jscad from '@jscad/modeling'
import type { Geom3 } from '@jscad/modeling/src/geometries/types'
import { ValidationError } from '../../../catalog/errors'
import * as bistable from '../../../catalog/families/bistable-beam/geometry'
import * as leaf from '../../../catalog/families/leaf-hinge/geometry'
import * as notch from '../../../catalog/families/notch-hinge/geometry'
import * as guide from '../../../catalog/families/parallel-guide/geometry'
import * as serpentine from '../../../catalog/families/serpentine-spring/geometry'
import * as snap from '../../../catalog/families/snap-hook/geometry'

const { booleans, primitives, measurements } = jscad

// JSCAD's booleans snap vertices to 1e-5 × the mean size of the part (a few 1e-4 mm here),
// so sections are compared to 3 decimals (5e-4 mm).

/** Extent in y of the solid's section through x = x0 (a 2 µm slab), limited to yMin..yMax. */
function sectionY(solid: Geom3, x0: number, yMin: number, yMax: number, zMax: number): [number, number] {
  const slab = primitives.cuboid({ size: [0.002, yMax - yMin, zMax + 2], center: [x0, (yMin + yMax) / 2, zMax / 2] })
  const [[, lo], [, hi]] = measurements.measureBoundingBox(booleans.intersect(solid, slab))
  return [lo, hi]
}

describe('bistable-beam solid', () => {
  const p = { span: 40, apexHeight: 3, thickness: 0.6, depth: 5, postLength: 0 }
  it('sections the two beams at quarter span where w0 = apexHeight/2, a vertical thickness t·√(1 + w0′²) (Qiu, Lang & Slocum 2004 shape)', () => {
    const L = bistable.layout(p)
    const [observedLow, observedHigh] = sectionY(bistable.build(p), p.span / 4, L.baseTop + 0.01, L.wallTop - 0.01, p.depth)
    const slope = (p.apexHeight / 2) * ((2 * Math.PI) / p.span)
    const halfVertical = (p.thickness / 2) * Math.hypot(1, slope)
    expect(observedLow).toBeCloseTo(p.apexHeight / 2 - halfVertical, 3)
    expect(observedHigh).toBeCloseTo(L.beamOffset + p.apexHeight / 2 + halfVertical, 3)
  })

  it('leaves the shuttle room to travel 2·apexHeight above the base bar and the posts clear of the walls', () => {
    for (const postLength of [0, 1, 8, 30]) {
      const L = bistable.layout({ ...p, postLength })
      expect(L.shuttleBottom - 2 * p.apexHeight - L.baseTop).toBeGreaterThanOrEqual(bistable.TRAVEL_CLEARANCE - 1e-12)
      if (postLength > 0) expect(-p.thickness / 2 - L.innerX).toBe(bistable.POST_CLEARANCE)
      // the upper posts' ledges stay above the lower beam
      if (postLength > 0) expect(L.beamOffset - postLength - bistable.LEDGE).toBeGreaterThan(p.thickness / 2)
    }
  })

  it('envelope: x = span + 2 frame walls (+ post clearances), z = depth', () => {
    expect(bistable.envelope(p).x).toBe(p.span + 2 * bistable.FRAME_WALL)
    expect(bistable.envelope({ ...p, postLength: 8 }).x).toBeCloseTo(p.span + 2 * bistable.FRAME_WALL + 2 * (p.thickness / 2 + bistable.POST_CLEARANCE), 12)
    expect(bistable.envelope(p).z).toBe(p.depth)
  })
})

describe('leaf-hinge solid', () => {
  const p = { length: 6, thickness: 0.6, depth: 8, linkLength: 30 }
  it('has a blade of the given thickness at mid-length', () => {
    const [lo, hi] = sectionY(leaf.build(p), p.length / 2, -10, 10, p.depth)
    expect(hi - lo).toBeCloseTo(p.thickness, 3)
  })
  it('envelope: fixed link (at least 10) + blade + moving link by LINK_HEIGHT by depth', () => {
    expect(leaf.envelope(p)).toEqual({ x: 30 + 6 + 30, y: leaf.LINK_HEIGHT, z: 8 })
    expect(leaf.envelope({ ...p, linkLength: 2 }).x).toBe(10 + 6 + 2)
  })
})

describe('notch-hinge solid', () => {
  it('has its thinnest section, the neck, exactly neckThickness wide at x = 0', () => {
    for (const blockThickness of [4, 6.8, 12]) {
      const p = { radius: 3, neckThickness: 0.8, depth: 8, blockThickness }
      const [lo, hi] = sectionY(notch.build(p), 0, -blockThickness, blockThickness, p.depth)
      expect(hi - lo).toBeCloseTo(p.neckThickness, 3)
    }
  })
  it('envelope: 2·(radius + NOTCH_ARM) by blockThickness by depth', () => {
    expect(notch.envelope({ radius: 3, neckThickness: 0.8, depth: 8, blockThickness: 8 })).toEqual({ x: 26, y: 8, z: 8 })
  })
})

describe('parallel-guide solid', () => {
  const p = { length: 30, thickness: 0.8, depth: 8, spacing: 20 }
  it('sections two blades of the given thickness, spacing apart, at mid-length', () => {
    const solid = guide.build(p)
    const [lo1, hi1] = sectionY(solid, p.length / 2, 0, 20, p.depth)
    const [lo2, hi2] = sectionY(solid, p.length / 2, -20, 0, p.depth)
    expect(hi1 - lo1).toBeCloseTo(p.thickness, 3)
    expect(hi2 - lo2).toBeCloseTo(p.thickness, 3)
    expect((lo1 + hi1) / 2 - (lo2 + hi2) / 2).toBeCloseTo(p.spacing, 3)
  })
  it('envelope: base + length + stage by spacing + margins; two base holes only when a web fits between them', () => {
    expect(guide.envelope(p)).toEqual({ x: 8 + 30 + 8, y: 20 + 8, z: 8 })
    expect(guide.layout(p).holes).toHaveLength(3)
    expect(guide.layout({ ...p, spacing: 3 }).holes).toHaveLength(2)
  })
})

describe('serpentine-spring solid', () => {
  it('sections one span per pitch across the axis', () => {
    const p = { spans: 5, spanLength: 12, pitch: 2.4, thickness: 0.8, depth: 6 }
    const solid = serpentine.build(p)
    // a slab along the axis at y = 0 cuts every span once: count its pieces
    const slab = primitives.cuboid({ size: [40, 0.002, 10], center: [5, 0, 3] })
    const pieces = booleans.scission(booleans.intersect(solid, slab))
    expect(pieces).toHaveLength(p.spans)
  })
  it('envelope: (spans − 1)·pitch + 2 pads − thickness; pads on opposite sides for an odd count', () => {
    const p = { spans: 5, spanLength: 12, pitch: 2.4, thickness: 0.8, depth: 6 }
    expect(serpentine.envelope(p)).toEqual({ x: 4 * 2.4 + 16 - 0.8, y: 12 + 16, z: 6 })
    expect(serpentine.envelope({ ...p, spans: 4 }).y).toBe(12 + 8 + 0.4)
  })
})

describe('snap-hook solid', () => {
  const p = { length: 15, rootThickness: 1.6, tipThickness: 1.1, width: 6, undercut: 1.2, entryAngle: 30, retainAngle: 45, friction: 0.4 }
  const deg = Math.PI / 180
  it('has an entry face at entryAngle and a retaining face at retainAngle to the arm axis, the head undercut above the tip', () => {
    const { head, front, retainFoot } = snap.layout(p)
    const [, , tip, entryTop, landEnd, foot] = head
    expect(tip).toEqual([p.length, p.tipThickness])
    expect(entryTop[1] - tip[1]).toBeCloseTo(p.undercut, 12)
    expect(Math.atan2(entryTop[1] - tip[1], tip[0] - entryTop[0]) / deg).toBeCloseTo(p.entryAngle, 9)
    expect(Math.atan2(landEnd[1] - foot[1], landEnd[0] - foot[0]) / deg).toBeCloseTo(p.retainAngle, 9)
    expect(foot[1]).toBeCloseTo(front(retainFoot), 12)
    expect(entryTop[0] - landEnd[0]).toBeCloseTo(snap.HEAD_LAND, 12)
  })
  it('sections the arm at its root and tip with the root and tip thickness', () => {
    const solid = snap.build(p)
    const [lo0, hi0] = sectionY(solid, 0.001, -1, 10, p.width)
    const [lo1, hi1] = sectionY(solid, snap.layout(p).retainFoot - 0.001, -1, 10, p.width)
    expect(hi0 - lo0).toBeCloseTo(p.rootThickness, 3)
    expect(hi1 - lo1).toBeCloseTo(snap.layout(p).front(snap.layout(p).retainFoot), 3)
  })
  it('refuses a head longer than half the arm, naming the undercut', () => {
    const tooLong = { ...p, length: 4, rootThickness: 0.8, tipThickness: 0.4, undercut: 1.3, entryAngle: 5, retainAngle: 5 }
    expect(snap.headFitProblem(tooLong)).toMatch(/half the arm length/)
    expect(() => snap.build(tooLong)).toThrow(ValidationError)
    try {
      snap.build(tooLong)
    } catch (e) {
      expect((e as ValidationError).issues[0].field).toBe('undercut')
    }
    expect(snap.headFitProblem(p)).toBeNull()
  })
  it('envelope: base + length by the taller of base and head, z = width', () => {
    expect(snap.envelope(p)).toEqual({ x: 8 + 15, y: Math.max(1.6 + 3, 1.1 + 1.2) + 3, z: 6 })
  })
})
