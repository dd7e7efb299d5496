import { describe, expect, it } from 'vitest'
import type { TradeoffPoint } from '@/api'
import { palettes } from '@/theme/tokens'
import { FIRST_PAGE, groupOf, tradeoffOption } from '../tradeoffChart'

const point = (position: number | null, margin: number, safetyFactor: number | null, footprint: number | null): TradeoffPoint => ({
  entryId: 1, entryName: 'Switch', family: 'bistable-beam', params: { span: 60, material: 'petg' },
  margin, safetyFactor, footprint, position, variantOf: position === null ? 1 : null,
})

type Series = { name: string; data: Array<{ value: [number, number]; index: number }> }

describe('the trade-off scatter', () => {
  const points = [point(1, 0.3, 2.5, 900), point(FIRST_PAGE + 1, 0.1, 1.5, 700), point(null, 0.28, 2.4, 910), point(2, 0.2, null, 800)]
  const option = (axis: 'safety' | 'footprint') => tradeoffOption({ points, axis, palette: palettes.light, materialName: String }) as { series: Series[] }

  it('puts the first page, further results and close variants in their own series', () => {
    expect(points.map((p) => groupOf(p))).toEqual(['first-page', 'further', 'variant', 'first-page'])
    const byName = Object.fromEntries(option('safety').series.map((s) => [s.name, s.data.map((d) => d.index)]))
    // the point without a strain safety factor has no place on that axis
    expect(byName).toEqual({ 'Listed on the first page': [0], 'Further results': [1], 'Close variants': [2] })
  })

  it('plots margin in per cent against strain safety, or against footprint', () => {
    const first = (axis: 'safety' | 'footprint') => option(axis).series.find((s) => s.name === 'Listed on the first page')!.data
    expect(first('safety')).toEqual([{ value: [2.5, 30], index: 0 }])
    expect(first('footprint')).toEqual([{ value: [900, 30], index: 0 }, { value: [800, 20], index: 3 }])
  })
})
