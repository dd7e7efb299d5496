import { describe, expect, it } from 'vitest'
import { serializeStl } from '../../../catalog/geometry/stl'
import { checkStl, type MeshReport } from '../../../catalog/geometry/mesh-check'
import { analyticArea } from './analytic'
import { casesOf, familyIds, geometryOf, type Params } from './cases'

/** JSCAD's epsilon for a box of this size: 1e-5 × the mean side (measureEpsilon). */
const jscadEpsilon = (sides: number[]) => (1e-5 * sides.reduce((a, b) => a + b, 0)) / sides.length

/**
 * How far vertices may sit from their exact place: the 2D booleans work on walls z ∈ [−1, 1]
 * and snap to their epsilon, the serializer snaps to the solid's epsilon (half a step each way),
 * float32 rounds at 6e-8 relative.
 */
function vertexSlack(env: { x: number; y: number; z: number }): number {
  return jscadEpsilon([env.x, env.y, 2]) + jscadEpsilon([env.x, env.y, env.z]) / 2 + 1e-7 * Math.max(env.x, env.y, env.z)
}

const meshes = new Map<string, { bytes: Uint8Array; report: MeshReport }>()
function meshOf(id: string, params: Params) {
  const key = `${id} ${JSON.stringify(params)}`
  let m = meshes.get(key)
  if (!m) {
    const bytes = serializeStl(geometryOf[id].build(params))
    m = { bytes, report: checkStl(bytes) }
    meshes.set(key, m)
  }
  return m
}

describe.each(familyIds)('%s solid', (id) => {
  describe.each(casesOf(id))(`${id} (%s)`, (_name, params) => {
    it('has as many triangles as its header says, every edge shared by exactly two, consistently oriented', () => {
      const { bytes, report } = meshOf(id, params)
      expect(report.triangleCount).toBe((bytes.byteLength - 84) / 50)
      expect(report.headerCount).toBe(report.triangleCount)
      expect(report.unpairedEdges).toBe(0)
      expect(report.orientationErrors).toBe(0)
      expect(report.degenerateTriangles).toBe(0)
    })

    it('encloses the analytic volume (plan area × print height) within the faceting bound', () => {
      const { report } = meshOf(id, params)
      const env = geometryOf[id].envelope(params)
      const { area, facetBound } = analyticArea[id](params)
      const expected = area * env.z
      // inscribed hole polygons and chords of curved beams (facetBound), plus every vertex
      // moved by at most the snapping slack over the whole surface
      const tolerance = facetBound * env.z + report.surfaceArea * Math.sqrt(3) * vertexSlack(env)
      expect(report.volume).toBeGreaterThan(0)
      expect(Math.abs(report.volume - expected)).toBeLessThanOrEqual(tolerance)
      // and the bound itself is tight enough to mean something
      expect(tolerance / expected).toBeLessThan(0.01)
    })

    it('has the bounding box of its envelope, z from 0 to the print height', () => {
      const { report } = meshOf(id, params)
      const env = geometryOf[id].envelope(params)
      const slack = 2 * vertexSlack(env)
      const expected = [env.x, env.y, env.z]
      report.box.size.forEach((observed, k) => expect(Math.abs(observed - expected[k])).toBeLessThanOrEqual(slack))
      expect(Math.abs(report.box.min[2])).toBeLessThanOrEqual(slack)
      expect(env.z).toBe(id === 'snap-hook' ? params.width : params.depth)
    })

    it('gives identical bytes for the same parameters', () => {
      const { bytes } = meshOf(id, params)
      const again = serializeStl(geometryOf[id].build({ ...params }))
      expect(Buffer.from(again).equals(Buffer.from(bytes))).toBe(true)
    })
  })
})
