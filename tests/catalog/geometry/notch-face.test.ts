import { describe, expect, it } from 'vitest'
import { buildGeometry, serializeStl } from '../../../catalog/index'
import { checkStl } from '../../../catalog/geometry/mesh-check'

// Found by the build fuzz: a notch-circle vertex landing on the block face left an open mesh.
describe('notch-hinge (circle vertex on the block face)', () => {
  it('builds a closed solid when a notch vertex falls on the face', () => {
    const observed = checkStl(serializeStl(buildGeometry('notch-hinge', { neckThickness: 0.3, blockThickness: 1.9211165175234484 })))
    expect(observed.unpairedEdges).toBe(0)
    expect(observed.orientationErrors).toBe(0)
    expect(observed.triangleCount).toBe(observed.headerCount)
    expect(observed.volume).toBeGreaterThan(0)
  })
})
