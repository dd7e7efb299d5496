import { describe, expect, it } from 'vitest'
import { palettes } from '@/theme/tokens'
import { curveChartOption } from '../curveChart'

const curve = { displacement: [0, 1, 2, 3, 4], force: [0, 2, 0, -1, 0], axes: { displacement: { label: 'Shuttle displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } } }

describe('the entry page chart\u2019s unstable-position marker', () => {
  for (const mode of ['light', 'dark'] as const) {
    it(`is an ink ring with a clear middle on the ${mode} theme, so the line shows through it`, () => {
      const p = palettes[mode]
      const option = curveChartOption({ live: null, stored: curve as never, storedLabel: 'Stored', markers: [{ kind: 'unstable', x: 2, y: 0 }], window: null, palette: p }) as { series: Array<{ markPoint?: { data: Array<{ itemStyle: { color: string; borderColor: string; borderWidth: number }; symbol: string }> } }> }
      const marker = option.series[0].markPoint!.data[0]
      expect(marker.symbol).toBe('circle')
      expect(marker.itemStyle.borderColor).toBe(p.ink)
      expect(marker.itemStyle.borderColor).not.toBe(p.surface)
      expect(marker.itemStyle.borderWidth).toBeGreaterThanOrEqual(2)
      // fully transparent fill: alpha 0
      expect(marker.itemStyle.color).toMatch(/rgba\(.*,\s*0\)$/)
    })
  }
})
