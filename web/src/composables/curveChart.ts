/** The echarts option for a curve plot, built from plain data so it is tested without a canvas. */
import type { Curve } from '@/api/types'
import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { axisName, valueAxisStyle } from './chartAxes'
import { markerLabels, unstableMarkerStyle, type CurveMarker } from './curveMarkers'
import { formatNumber, type ForceWindow } from './metrics'

export interface CurveChartInput {
  live: Curve | null
  stored: Curve | null
  storedLabel: string
  markers: CurveMarker[]
  window: ForceWindow | null
  palette: Palette
}

function points(curve: Curve): Array<[number, number]> {
  return curve.displacement.map((x, i) => [x, curve.force[i]])
}


const symbols: Record<CurveMarker['kind'], { symbol: string; size: number }> = {
  stable: { symbol: 'circle', size: 11 },
  // a ring ('emptyCircle' strokes in the fill colour, so it showed no outline): see unstableMarkerStyle
  unstable: { symbol: 'circle', size: 12 },
  peak: { symbol: 'triangle', size: 12 },
  valley: { symbol: 'path://M0,0 L10,0 L5,9 Z', size: 12 },
}

export function curveChartOption(input: CurveChartInput): Record<string, unknown> {
  const { live, stored, palette: p, window } = input
  const main = live ?? stored
  const axes = main?.axes ?? { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } }
  const xUnit = axes.displacement.unit
  const yUnit = axes.force.unit
  const hasWindow = !!window && (window.min !== null || window.max !== null)
  const inWindow = (y: number) => hasWindow && (window!.min === null || y >= window!.min) && (window!.max === null || y <= window!.max)

  const markData = input.markers.map((m) => ({
    name: markerLabels[m.kind],
    coord: [m.x, m.y],
    symbol: symbols[m.kind].symbol,
    symbolSize: symbols[m.kind].size,
    symbolRotate: 0,
    itemStyle: m.kind === 'unstable' ? unstableMarkerStyle(p) : {
      color: (m.kind === 'peak' || m.kind === 'valley') && inWindow(m.y) ? p.window : p.ink,
      borderColor: (m.kind === 'peak' || m.kind === 'valley') && inWindow(m.y) ? p.window : p.ink,
      borderWidth: 0,
    },
    label: {
      show: m.kind === 'peak' || m.kind === 'valley',
      formatter: `${formatNumber(m.y)} ${yUnit}`,
      position: m.kind === 'valley' ? 'bottom' : 'top',
      color: inWindow(m.y) ? p.window : p.ink,
      fontFamily,
      fontSize: 12,
      fontWeight: 500,
      distance: 8,
    },
  }))

  const series: Array<Record<string, unknown>> = []
  if (stored) {
    series.push({
      name: input.storedLabel,
      type: 'line',
      data: points(stored),
      showSymbol: false,
      smooth: false,
      lineStyle: { color: p.stored, width: live ? 2 : 2.5, type: live ? 'dashed' : 'solid' },
      itemStyle: { color: p.stored },
      z: 1,
      silent: !!live,
    })
  }
  if (live) {
    series.push({
      name: 'This configuration',
      type: 'line',
      data: points(live),
      showSymbol: false,
      lineStyle: { color: p.secondary, width: 2.5 },
      itemStyle: { color: p.secondary },
      z: 3,
    })
  }
  const host = series[series.length - 1]
  if (host) {
    host.markPoint = { data: markData, animation: false }
    host.markLine = {
      silent: true,
      symbol: 'none',
      label: { show: false },
      lineStyle: { color: p.line, type: 'solid', width: 1 },
      data: [{ yAxis: 0 }],
      animation: false,
    }
    if (hasWindow) {
      host.markArea = {
        silent: true,
        itemStyle: { color: p.windowBand },
        label: { show: true, position: 'insideTopRight', formatter: `${axes.force.label.toLowerCase()} window`, color: p.window, fontFamily, fontSize: 11 },
        data: [[{ yAxis: window!.min ?? 'min' }, { yAxis: window!.max ?? 'max' }]],
      }
    }
  }

  const axisCommon = valueAxisStyle(p)

  return {
    backgroundColor: 'transparent',
    animation: false,
    textStyle: { fontFamily, color: p.ink },
    grid: { left: 64, right: 64, top: 36, bottom: 52 },
    legend: {
      show: series.length > 1,
      top: 0,
      right: 8,
      textStyle: { color: p.inkMuted, fontFamily, fontSize: 12 },
      itemWidth: 22,
      itemHeight: 3,
      icon: 'rect',
    },
    tooltip: {
      trigger: 'axis',
      backgroundColor: p.surface,
      borderColor: p.line,
      textStyle: { color: p.ink, fontFamily, fontSize: 12 },
      axisPointer: { type: 'line', lineStyle: { color: p.inkMuted, type: 'dashed' } },
      valueFormatter: (v: number) => `${formatNumber(v)} ${yUnit}`,
    },
    xAxis: { ...axisCommon, type: 'value', name: axisName(axes.displacement), nameGap: 32, min: 'dataMin', max: 'dataMax', axisLabel: { ...axisCommon.axisLabel, formatter: (v: number) => `${formatNumber(v)}` } },
    yAxis: { ...axisCommon, type: 'value', name: axisName(axes.force), nameGap: 46, scale: false },
    series,
    aria: { enabled: true, label: { description: describeCurve(input.markers, xUnit, yUnit) } },
  }
}

/** A sentence about the curve for screen readers and the caption. */
export function describeCurve(markers: CurveMarker[], xUnit: string, yUnit: string): string {
  if (!markers.length) return 'The curve has no marked points.'
  return markers
    .map((m) => (m.kind === 'peak' || m.kind === 'valley')
      ? `${markerLabels[m.kind]} ${formatNumber(m.y)} ${yUnit} at ${formatNumber(m.x)} ${xUnit}`
      : `${markerLabels[m.kind]} at ${formatNumber(m.x)} ${xUnit}`)
    .join('; ') + '.'
}
