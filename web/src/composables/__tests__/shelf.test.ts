import { describe, expect, it } from 'vitest'
import type { EntrySummary, Family } from '@/api/types'
import { compareNullable, emptyFilters, filterRows, shelfRows, tagsOf } from '../shelf'

function entry(id: number, over: Partial<EntrySummary> = {}): EntrySummary {
  return {
    id, familyId: 'bistable-beam', familyName: 'Bistable curved beam', kind: 'bistable', name: `Entry ${id}`, summary: 'Power switch for the sensor node',
    tags: [], status: 'released', owner: { id: 1, displayName: 'L' }, currentRevision: { id: id * 10, number: 1, metrics: { peakForce: id } },
    updatedAt: '2025-03-01T10:00:00Z', ...over,
  }
}
const family = { id: 'bistable-beam', kind: 'bistable', metrics: [{ key: 'peakForce', label: 'Peak force', unit: 'N' }] } as unknown as Family

describe('shelfRows', () => {
  it('attaches the key metric of the current revision', () => {
    const [row] = shelfRows([entry(4)], [family])
    expect(row.keyMetric).toEqual({ spec: { key: 'peakForce', label: 'Peak force', unit: 'N' }, value: 4 })
    expect(row.keyValue).toBe(4)
    expect(row.updatedTime).toBe(Date.parse('2025-03-01T10:00:00Z'))
  })
  it('has no key value without a revision or an unknown family', () => {
    expect(shelfRows([entry(1, { currentRevision: null })], [family])[0].keyValue).toBeNull()
    expect(shelfRows([entry(1, { familyId: 'unknown' })], [family])[0].keyMetric).toBeNull()
  })
})

describe('filterRows', () => {
  const rows = [
    entry(1, { name: 'Battery door latch', familyId: 'snap-hook', tags: ['door', 'outdoor'] }),
    entry(2, { name: 'Power switch', tags: ['switch'], status: 'retired' }),
    entry(3, { name: 'Cable clip', summary: 'Holds a 6 mm cable', tags: ['outdoor'] }),
  ]
  it('keeps everything with empty filters', () => {
    expect(filterRows(rows, emptyFilters())).toHaveLength(3)
  })
  it('matches every word of the text in any field, any case', () => {
    expect(filterRows(rows, { ...emptyFilters(), text: 'CABLE 6' }).map((r) => r.id)).toEqual([3])
    expect(filterRows(rows, { ...emptyFilters(), text: 'outdoor' }).map((r) => r.id)).toEqual([1, 3])
  })
  it('filters by family, status and all chosen tags', () => {
    expect(filterRows(rows, { ...emptyFilters(), families: ['snap-hook'] }).map((r) => r.id)).toEqual([1])
    expect(filterRows(rows, { ...emptyFilters(), statuses: ['retired'] }).map((r) => r.id)).toEqual([2])
    expect(filterRows(rows, { ...emptyFilters(), tags: ['outdoor', 'door'] }).map((r) => r.id)).toEqual([1])
  })
})

describe('tagsOf / compareNullable', () => {
  it('lists tags once, sorted', () => {
    expect(tagsOf([entry(1, { tags: ['b', 'a'] }), entry(2, { tags: ['a', 'c'] })])).toEqual(['a', 'b', 'c'])
  })
  it('sorts missing values last', () => {
    expect([3, null, 1].sort(compareNullable)).toEqual([1, 3, null])
  })
})
