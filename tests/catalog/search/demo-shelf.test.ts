import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { DEMO_SHELF } from '../../../catalog/search'

// catalog/ may not import api/, so the CLI's built-in shelf is a copy of the seed's released
// entries; this keeps the copy in step with api/db/demo-shelf.ts.
const seedFile = fileURLToPath(new URL('../../../api/db/demo-shelf.ts', import.meta.url))

describe('built-in demo shelf', () => {
  it.runIf(existsSync(seedFile))('holds exactly the released entries of the API seed', async () => {
    const { DEMO_SHELF: seed } = await import('../../../api/db/demo-shelf')
    const expected = Object.entries(seed).flatMap(([familyId, entries]) => entries
      .filter((e) => e.status === 'released')
      .map((e) => ({ familyId, name: e.name, summary: e.summary, tags: e.tags, materials: e.materials, defaultParams: e.defaultParams, ranges: e.ranges, status: e.status })))
    const observed = DEMO_SHELF.map(({ id: _id, ...rest }) => rest)
    expect(observed).toEqual(expected)
  })

  it('gives every entry a unique id', () => {
    expect(new Set(DEMO_SHELF.map((e) => e.id)).size).toBe(DEMO_SHELF.length)
  })
})
