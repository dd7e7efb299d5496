/**
 * The STL writer's direct path against the package serializer (@jscad/stl-serializer, the
 * reference here): byte for byte the same file for every family at its defaults and at the
 * corners of its ranges, and for a solid the direct path refuses (a cube of quadrilaterals).
 * And the solid cache: the same parameters give the same solid, other parameters another.
 */
import { describe, expect, it } from 'vitest'
import jscad from '@jscad/modeling'
import { buildGeometry, clearSolidCache } from '../../../catalog'
import { packageStl, serializeStl } from '../../../catalog/geometry/stl'
import { casesOf, familyIds, geometryOf } from './cases'

function sameBytes(a: Uint8Array, b: Uint8Array): boolean {
  return a.length === b.length && a.every((v, i) => v === b[i])
}

describe('STL writer', () => {
  for (const id of familyIds) {
    it(`${id}: the same bytes as the package serializer at every case`, () => {
      for (const [, params] of casesOf(id)) {
        const solid = geometryOf[id].build(params)
        const ours = serializeStl(solid)
        expect(sameBytes(ours, packageStl(solid))).toBe(true)
        // 84-byte header and count, 50 bytes per triangle
        expect((ours.length - 84) % 50).toBe(0)
      }
    })
  }

  it('a solid of quadrilaterals goes through the package serializer (12 triangles for a cube)', () => {
    const cube = jscad.primitives.cuboid({ size: [2, 3, 4] })
    const bytes = serializeStl(cube)
    expect(new DataView(bytes.buffer).getUint32(80, true)).toBe(12)
    expect(sameBytes(bytes, packageStl(cube))).toBe(true)
  })
})

describe('solid cache', () => {
  it('gives the same solid for the same parameters and builds another for other ones', () => {
    clearSolidCache()
    const [[, first], [, second]] = casesOf('leaf-hinge')
    const a = buildGeometry('leaf-hinge', first)
    expect(buildGeometry('leaf-hinge', { ...first })).toBe(a)
    const b = buildGeometry('leaf-hinge', second)
    expect(b).not.toBe(a)
    expect(sameBytes(serializeStl(b), serializeStl(geometryOf['leaf-hinge'].build(second)))).toBe(true)
    clearSolidCache()
    expect(buildGeometry('leaf-hinge', first)).not.toBe(a)
  })
})
