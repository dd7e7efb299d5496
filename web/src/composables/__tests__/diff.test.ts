import { describe, expect, it } from 'vitest'
import { changeCount, diffSnapshots, snapshotsFromRows, formatFeatureDifference, formatFieldValue, formatMetricDifference, formatParamValue, formatRange, formatSigned, sameValue } from '../diff'
import type { ParamSpec, MetricSpec } from '@/api/types'

const params: ParamSpec[] = [
  { key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 1, help: '' },
  { key: 'thickness', label: 'Thickness', unit: 'mm', default: 0.6, min: 0.3, max: 2, step: 0.05, help: '' },
]
const metrics: MetricSpec[] = [
  { key: 'stiffness', label: 'Stiffness', unit: 'N/mm' },
  { key: 'bistable', label: 'Bistable', unit: 'boolean' },
]
const family = { params, metrics }

describe('diffSnapshots', () => {
  const a = { params: { span: 40, thickness: 0.6, material: 'petg' }, ranges: { span: [30, 50] as [number, number] }, metrics: { stiffness: 0.422, bistable: false } }
  const b = { params: { span: 40, thickness: 0.7, material: 'petg' }, ranges: { span: [30, 50] as [number, number], thickness: [0.5, 0.8] as [number, number] }, metrics: { stiffness: 0.67, bistable: false } }

  it('lists parameters in the family order, the material last, and marks what changed', () => {
    const observed = diffSnapshots(family, a, b)
    expect(observed.params.map((r) => [r.key, r.changed])).toEqual([['span', false], ['thickness', true], ['material', false]])
    expect(observed.params[2].label).toBe('Material')
  })

  it("compares an unnarrowed range as the family's own", () => {
    const observed = diffSnapshots(family, a, b)
    const thickness = observed.ranges.find((r) => r.key === 'thickness')!
    expect(thickness.a).toEqual([0.3, 2])
    expect(thickness.b).toEqual([0.5, 0.8])
    expect(thickness.changed).toBe(true)
    expect(observed.ranges.find((r) => r.key === 'span')!.changed).toBe(false)
  })

  it('gives the metric difference b − a and leaves flags without one', () => {
    const observed = diffSnapshots(family, a, b)
    expect(observed.metrics[0].difference).toBeCloseTo(0.248, 12)
    expect(observed.metrics[1]).toMatchObject({ difference: null, changed: false })
    expect(changeCount(observed)).toBe(3) // thickness, its range, stiffness
  })

  it('keeps keys the family does not know, by their key', () => {
    const observed = diffSnapshots(family, { params: { legacy: 1 }, ranges: {}, metrics: {} }, { params: {}, ranges: {}, metrics: {} })
    expect(observed.params).toEqual([{ key: 'legacy', label: 'legacy', unit: '', a: 1, b: null, changed: true }])
  })
})

describe('snapshotsFromRows', () => {
  it("turns the server's side-by-side rows back into two snapshots, leaving out missing values", () => {
    const observed = snapshotsFromRows({
      params: [{ key: 'span', label: 'Span', unit: 'mm', a: null, b: 40, changed: true }],
      ranges: [{ key: 'thickness', label: 'Thickness', unit: 'mm', a: null, b: [0.3, 0.9], changed: true }],
      metrics: [{ key: 'stiffness', label: 'Stiffness', unit: 'N/mm', a: null, b: 0.48, difference: null, changed: true }],
    })
    expect(observed.a).toEqual({ params: {}, ranges: {}, metrics: {} })
    expect(observed.b).toEqual({ params: { span: 40 }, ranges: { thickness: [0.3, 0.9] }, metrics: { stiffness: 0.48 } })
    // through diffSnapshots every parameter gets a range row, the family's own where not narrowed
    const rows = diffSnapshots(family, observed.a, observed.b)
    expect(rows.ranges.map((r) => [r.key, r.b])).toEqual([['span', [10, 120]], ['thickness', [0.3, 0.9]]])
  })
})

describe('sameValue', () => {
  it('treats a JSON round trip of a number as the same number', () => {
    expect(sameValue(0.1 + 0.2, 0.3)).toBe(true)
    expect(sameValue(0.3, 0.31)).toBe(false)
    expect(sameValue([1, 2], [1, 2])).toBe(true)
    expect(sameValue(null, undefined)).toBe(true)
    expect(sameValue('petg', 'abs')).toBe(false)
  })
})

describe('formatting', () => {
  it('writes values and ranges with their unit', () => {
    expect(formatParamValue(0.7, 'mm')).toBe('0.7 mm')
    expect(formatParamValue('petg', '', (id) => (id === 'petg' ? 'PETG (FDM)' : id))).toBe('PETG (FDM)')
    expect(formatParamValue(null, 'mm')).toBe('—')
    expect(formatRange([0.5, 0.8], 'mm')).toBe('0.5–0.8 mm')
    expect(formatRange(null, 'mm')).toBe('—')
  })

  it('signs changes with a true minus and a plus', () => {
    expect(formatSigned(0.248, 'N/mm')).toBe('+0.248 N/mm')
    expect(formatSigned(-12, '%')).toBe('−12 %')
    expect(formatSigned(null)).toBe('')
  })

  it('adds the relative change to a metric difference', () => {
    expect(formatMetricDifference({ a: 0.422, difference: 0.248, unit: 'N/mm' })).toBe('+0.248 N/mm (+59 %)')
    expect(formatMetricDifference({ a: 1, difference: 0, unit: 'N' })).toBe('')
    expect(formatMetricDifference({ a: 0, difference: 2, unit: 'N' })).toBe('+2 N')
  })

  it('writes measured against predicted with the relative difference', () => {
    expect(formatFeatureDifference({ measured: 3.29, predicted: 3.65, difference: -0.36, relative: -0.36 / 3.65 }, 'N')).toBe('3.29 N vs 3.65 N, −9.9 %')
    expect(formatFeatureDifference({ measured: 1, predicted: 0, difference: 1, relative: null }, 'N')).toBe('1 N vs 0 N, +1 N')
    expect(formatFeatureDifference(null, 'N')).toBe('—')
  })

  it('joins list fields and names materials', () => {
    expect(formatFieldValue(['petg', 'abs'], (id) => id.toUpperCase())).toBe('PETG, ABS')
    expect(formatFieldValue([])).toBe('—')
    expect(formatFieldValue('')).toBe('—')
  })
})
