import { describe, expect, it } from 'vitest'
import { initialRangeModel, rangeBar, rangeIssues, rangesBody } from '../rangeEditor'
import type { ParamSpec } from '@/api/types'

const params: ParamSpec[] = [
  { key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 1, help: '' },
  { key: 'spans', label: 'Spans', unit: '', default: 5, min: 2, max: 12, step: 1, help: '', integer: true },
]

describe('initialRangeModel', () => {
  it("starts from the given ranges, else the family's limits", () => {
    expect(initialRangeModel(params, { span: [30, 50] })).toEqual({ span: { min: 30, max: 50 }, spans: { min: 2, max: 12 } })
  })
})

describe('rangeIssues', () => {
  it('accepts ranges inside the limits that hold the defaults', () => {
    expect(rangeIssues(params, { span: { min: 30, max: 50 }, spans: { min: 2, max: 12 } }, { span: 40, spans: 5 })).toEqual([])
  })

  it("names a range outside the family's limits by the server's field name", () => {
    const observed = rangeIssues(params, { span: { min: 5, max: 50 }, spans: { min: 2, max: 14 } })
    expect(observed.map((i) => i.field)).toEqual(['ranges.span', 'ranges.spans'])
    expect(observed[0].message).toBe("Span: the lowest allowed value 5 mm is below the family's limit 10 mm")
    expect(observed[1].message).toBe("Spans: the highest allowed value 14 is above the family's limit 12")
  })

  it('refuses a minimum above the maximum and an empty end', () => {
    const observed = rangeIssues(params, { span: { min: 60, max: 50 }, spans: { min: null, max: 12 } })
    expect(observed[0].message).toContain('above the highest')
    expect(observed[1]).toMatchObject({ field: 'ranges.spans' })
    expect(observed[1].message).toContain('give both ends')
  })

  it('asks for the default to sit inside its range', () => {
    const observed = rangeIssues(params, { span: { min: 30, max: 35 }, spans: { min: 2, max: 12 } }, { span: 40, spans: 5 })
    expect(observed).toEqual([{ field: 'defaultParams.span', message: 'Span: the default 40 mm must lie inside the allowed range 30 mm–35 mm' }])
  })
})

describe('rangesBody', () => {
  it('sends only the narrowed ranges', () => {
    expect(rangesBody(params, { span: { min: 10, max: 120 }, spans: { min: 3, max: 12 } })).toEqual({ spans: [3, 12] })
    expect(rangesBody(params, initialRangeModel(params))).toEqual({})
  })
})

describe('rangeBar', () => {
  it("places the range and the default on the family's scale", () => {
    expect(rangeBar(params[0], { min: 32, max: 98 }, 65)).toEqual({ from: 0.2, to: 0.8, at: 0.5 })
  })
  it('clamps and orders ends typed the wrong way round', () => {
    expect(rangeBar(params[0], { min: 200, max: 0 }, null)).toEqual({ from: 0, to: 1, at: null })
  })
})
