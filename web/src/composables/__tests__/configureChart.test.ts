import { describe, expect, it } from 'vitest'
import { palettes } from '@/theme/tokens'
import { bandPolygon, configureChartOption, niceExtent, niceStep, showLastLabel, windowOverlays, withAlpha } from '../configureChart'

const axes = { displacement: { label: 'Shuttle displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } }

describe('window drawn on the curve', () => {
  it('draws a holding force h as the range at or below −h', () => {
    const observed = windowOverlays({ kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 } }, axes)
    expect(observed).toEqual([
      { kind: 'force-range', id: 'peakForce', label: 'Peak force window', min: 3, max: 5 },
      { kind: 'force-range', id: 'holdingForce', label: 'Holding force', min: null, max: -0.5 },
    ])
  })

  it('turns a rotational stiffness in N·mm/rad into a slope per degree on a curve in degrees', () => {
    const [o] = windowOverlays({ kind: 'hinge', rotationalStiffness: { min: 180 / Math.PI, max: 360 / Math.PI } }, { displacement: { label: 'Rotation', unit: 'deg' }, force: { label: 'Moment', unit: 'N·mm' } })
    expect(o.kind).toBe('slope-range')
    expect(o.min).toBeCloseTo(1, 12)
    expect(o.max).toBeCloseTo(2, 12)
  })

  it('shades the tolerance band between low and high and puts the nominal curve on top', () => {
    const band = { displacement: [0, 1, 2], low: [0, 1, 0], high: [0, 2, 1] }
    expect(bandPolygon(band)).toEqual([[0, 0], [1, 1], [2, 0], [2, 1], [1, 2], [0, 0]])
    const option = configureChartOption({
      nominal: { displacement: [0, 1, 2], force: [0, 1.5, 0.5], axes },
      band,
      overlays: windowOverlays({ kind: 'bistable', peakForce: { min: 1, max: 3 }, holdingForce: { min: 0.5 } }, axes),
      markers: [{ kind: 'peak', x: 1, y: 1.5 }],
      palette: palettes.light,
    }) as { series: Array<Record<string, any>>; yAxis: { min: number; max: number } }
    const names = option.series.map((s) => s.name)
    expect(names).toEqual(['Tolerance band', 'Tolerance low', 'Tolerance high', 'Nominal'])
    const nominal = option.series[3]
    expect(nominal.z).toBeGreaterThan(option.series[0].z)
    // the window in the accent colour, the open side of the holding force running past the axis end
    expect(nominal.markArea.itemStyle.color).toBe(palettes.light.windowBand)
    const [, holding] = nominal.markArea.data
    expect(holding[1].yAxis).toBe(-0.5)
    expect(holding[0].yAxis).toBeLessThan(option.yAxis.min)
    // the axis holds the curves and the window's finite bounds (3 N above the curve)
    expect(option.yAxis.max).toBeGreaterThanOrEqual(3)
  })
})

describe('plot helpers', () => {
  it('picks round steps and extents that hold zero and every value', () => {
    expect(niceStep(7)).toBe(2)
    expect(niceStep(0.6)).toBe(0.1)
    expect(niceExtent([-1.17, 4.57])).toEqual([-2, 5])
    expect(niceExtent([2, 2])).toEqual([0, 2])
    expect(niceExtent([0, 0])).toEqual([-1, 1])
  })

  it('labels the axis end unless it crowds the last round tick', () => {
    expect(showLastLabel(0, 4.2, 1)).toBe(false) // 4 and 4.2 would touch
    expect(showLastLabel(0, 49.4, 10)).toBe(true)
    expect(showLastLabel(0, 5, 1)).toBe(true) // the end is itself a tick
  })

  it('writes a token colour with an alpha', () => {
    expect(withAlpha('#3C5566', 0.2)).toBe('rgba(60, 85, 102, 0.2)')
  })
})
