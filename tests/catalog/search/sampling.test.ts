import { describe, expect, it } from 'vitest'
import { families } from '../../../catalog'
import { printerRules } from '../../../catalog/printability'
import { DEMO_SHELF, entryGrid, gridPoints, gridSize } from '../../../catalog/search'
import { GridCursor } from '../../../catalog/search/sampling'

describe('GridCursor', () => {
  for (const entry of DEMO_SHELF) {
    it(`${entry.familyId}: steps through the same points, in the same order, as gridPoints`, () => {
      const family = families.find((f) => f.id === entry.familyId)!
      const grid = entryGrid(family, entry, printerRules(), 400)
      // both refill one object: copy each point as it comes
      const expected: Array<Record<string, number>> = []
      for (const p of gridPoints(grid.axes)) expected.push({ ...p })
      const observed: Array<Record<string, number>> = []
      const cursor = new GridCursor(grid.axes)
      while (cursor.next()) observed.push({ ...cursor.params })
      expect(observed).toEqual(expected)
      expect(observed.length).toBe(gridSize(grid.axes))
      expect(cursor.next()).toBe(false)
    })
  }
})
