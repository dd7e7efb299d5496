import { describe, expect, it } from 'vitest'
import jscad from '@jscad/modeling'
import { boundingBox, checkEdges, checkStl, parseBinaryStl, signedVolume } from '../../../catalog/geometry/mesh-check'
import { serializeStl } from '../../../catalog/geometry/stl'

type V = [number, number, number]

/** Binary STL written by hand, byte by byte, so the parser is checked against the format itself. */
function writeStl(triangles: [V, V, V][], headerCount = triangles.length): Uint8Array {
  const bytes = new Uint8Array(84 + 50 * triangles.length)
  const view = new DataView(bytes.buffer)
  view.setUint32(80, headerCount, true)
  triangles.forEach((tri, i) => {
    tri.forEach((v, k) => v.forEach((c, j) => view.setFloat32(84 + 50 * i + 12 + 12 * k + 4 * j, c, true)))
  })
  return bytes
}

/** Unit cube, outward-facing counter-clockwise triangles. */
function unitCube(): [V, V, V][] {
  const quads: V[][] = [
    [[0, 0, 0], [0, 1, 0], [1, 1, 0], [1, 0, 0]],
    [[0, 0, 1], [1, 0, 1], [1, 1, 1], [0, 1, 1]],
    [[0, 0, 0], [1, 0, 0], [1, 0, 1], [0, 0, 1]],
    [[0, 1, 0], [0, 1, 1], [1, 1, 1], [1, 1, 0]],
    [[0, 0, 0], [0, 0, 1], [0, 1, 1], [0, 1, 0]],
    [[1, 0, 0], [1, 1, 0], [1, 1, 1], [1, 0, 1]],
  ]
  return quads.flatMap((q) => [[q[0], q[1], q[2]], [q[0], q[2], q[3]]] as [V, V, V][])
}

describe('mesh checks of a binary STL', () => {
  it('a unit cube: 12 triangles, 18 edges each shared twice, volume 1, box 1 × 1 × 1', () => {
    const observed = checkStl(writeStl(unitCube()))
    expect(observed.headerCount).toBe(12)
    expect(observed.triangleCount).toBe(12)
    expect(observed.edges).toBe(18)
    expect(observed.unpairedEdges).toBe(0)
    expect(observed.orientationErrors).toBe(0)
    expect(observed.volume).toBeCloseTo(1, 12)
    expect(observed.surfaceArea).toBeCloseTo(6, 12)
    expect(observed.box.size).toEqual([1, 1, 1])
  })

  it('a cube with one triangle missing is open: three edges lose their partner', () => {
    const observed = checkEdges(unitCube().slice(1).map((vertices) => ({ normal: [0, 0, 0], vertices })))
    expect(observed.unpairedEdges).toBe(3)
  })

  it('a cube with one triangle turned inside out has inconsistent orientation', () => {
    const tris = unitCube()
    tris[0] = [tris[0][0], tris[0][2], tris[0][1]]
    const observed = checkEdges(tris.map((vertices) => ({ normal: [0, 0, 0], vertices })))
    expect(observed.unpairedEdges).toBe(0)
    expect(observed.orientationErrors).toBeGreaterThan(0)
  })

  it('an inverted cube has volume −1', () => {
    const tris = unitCube().map(([a, b, c]) => [a, c, b] as [V, V, V])
    expect(signedVolume(tris.map((vertices) => ({ normal: [0, 0, 0], vertices })))).toBeCloseTo(-1, 12)
  })

  it('refuses a file whose header count disagrees with its length', () => {
    expect(() => parseBinaryStl(writeStl(unitCube(), 13))).toThrow(/header says 13 triangles/)
    expect(() => parseBinaryStl(new Uint8Array(40))).toThrow(/at least 84 bytes/)
  })

  it('a JSCAD cuboid 2 × 3 × 4 serialized by serializeStl reads back closed with volume 24', () => {
    const bytes = serializeStl(jscad.primitives.cuboid({ size: [2, 3, 4], center: [1, 1.5, 2] }))
    const observed = checkStl(bytes)
    expect(observed.triangleCount).toBe((bytes.byteLength - 84) / 50)
    expect(observed.unpairedEdges).toBe(0)
    // the serializer snaps vertices to a grid of 1e-5 × the mean box size (3e-5 mm here)
    expect(Math.abs(observed.volume - 24)).toBeLessThan(24 * 3 * 3e-5)
    const box = boundingBox(parseBinaryStl(bytes).triangles)
    box.size.forEach((observedSize, k) => expect(Math.abs(observedSize - [2, 3, 4][k])).toBeLessThanOrEqual(3e-5))
  })
})
