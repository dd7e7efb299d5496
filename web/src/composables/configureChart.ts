/**
 * The echarts option for the configure screen's plot (and the data sheet's): the nominal curve
 * on top, the tolerance band shaded between its low and high curves, the force window drawn
 * in the accent colour and the stable and unstable positions marked. Built from plain data so
 * it is tested without a canvas.
 */
import type { ForceWindow } from '@catalog/window/schema'
import type { Curve } from '@/api/types'
import type { WindowOverlay } from '@/api/configure'
import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { axisName, valueAxisStyle } from './chartAxes'
import { markerLabels, unstableMarkerStyle, type CurveMarker } from './curveMarkers'
import { formatNumber } from './metrics'
import { RAD_PER_DEG } from '@catalog/units'

type Axes = Curve['axes']


/**
 * The window's bounds in the curve's own units. A holding force h is a pull back into the
 * second position, so the valley must lie at or below −h; a rotational stiffness in N·mm/rad
 * on a curve in degrees is a slope of k·π/180 per degree.
 */
export function windowOverlays(window: ForceWindow | null, axes: Axes): WindowOverlay[] {
  if (!window) return []
  const w = window as unknown as Record<string, { min?: number; max?: number } | undefined>
  const out: WindowOverlay[] = []
  const r = (x: { min?: number; max?: number }) => ({ min: x.min ?? null, max: x.max ?? null })
  if (w.peakForce) out.push({ kind: 'force-range', id: 'peakForce', label: 'Peak force window', ...r(w.peakForce) })
  if (w.matingForce) out.push({ kind: 'force-range', id: 'matingForce', label: 'Mating force window', ...r(w.matingForce) })
  if (w.holdingForce) {
    const h = w.holdingForce
    out.push({ kind: 'force-range', id: 'holdingForce', label: 'Holding force', min: h.max !== undefined ? -h.max : null, max: h.min !== undefined ? -h.min : null })
  }
  if (w.travel) out.push({ kind: 'displacement-range', id: 'travel', label: 'Travel', ...r(w.travel) })
  if (w.rotation) out.push({ kind: 'displacement-range', id: 'rotation', label: 'Rotation', ...r(w.rotation) })
  if (w.stiffness) out.push({ kind: 'slope-range', id: 'stiffness', label: 'Stiffness window', ...r(w.stiffness) })
  if (w.rotationalStiffness && axes.displacement.unit === 'deg') {
    const k = w.rotationalStiffness
    out.push({ kind: 'slope-range', id: 'rotationalStiffness', label: 'Stiffness window', min: k.min !== undefined ? k.min * RAD_PER_DEG : null, max: k.max !== undefined ? k.max * RAD_PER_DEG : null })
  }
  return out
}

/** `#3C5566` with an alpha as `rgba(…)`: the secondary slate as a translucent fill. */
export function withAlpha(hex: string, alpha: number): string {
  const m = /^#([0-9a-f]{6})$/i.exec(hex)
  if (!m) return hex
  const n = parseInt(m[1], 16)
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`
}

/** The closed outline of a band: along the low curve, back along the high one. */
export function bandPolygon(band: { displacement: number[]; low: number[]; high: number[] }): Array<[number, number]> {
  const n = Math.min(band.displacement.length, band.low.length, band.high.length)
  const pts: Array<[number, number]> = []
  for (let i = 0; i < n; i++) pts.push([band.displacement[i], band.low[i]])
  for (let i = n - 1; i >= 0; i--) pts.push([band.displacement[i], band.high[i]])
  return pts
}

/** A round step near span/targetTicks: 1, 2 or 5 times a power of ten. */
export function niceStep(span: number, targetTicks = 6): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1
  const raw = span / targetTicks
  const power = 10 ** Math.floor(Math.log10(raw))
  const f = raw / power
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * power
}

/** Axis ends on round steps that hold every value (and zero, so the axis line is in view). */
export function niceExtent(values: readonly number[]): [number, number] {
  const finite = values.filter(Number.isFinite)
  let lo = Math.min(0, ...finite)
  let hi = Math.max(0, ...finite)
  if (lo === hi) { lo -= 1; hi += 1 }
  const step = niceStep(hi - lo)
  return [Math.floor(lo / step + 1e-9) * step, Math.ceil(hi / step - 1e-9) * step].map((v) => Number(v.toPrecision(12))) as [number, number]
}

/** The axis end gets its own label unless it would crowd the last round tick (closer than 40 % of a step). */
export function showLastLabel(min: number, max: number, step: number): boolean {
  const past = (max - min) / step - Math.floor((max - min) / step + 1e-9)
  return past < 1e-6 || past > 0.4
}

export interface ConfigureChartInput {
  nominal: Curve | null
  band: { displacement: number[]; low: number[]; high: number[] } | null
  overlays: WindowOverlay[]
  markers: CurveMarker[]
  palette: Palette
  /** Label of the band in the legend ("Tolerance band ±0.05 mm, ±10 %"). */
  bandLabel?: string
  /** No animation and no tooltip: the printed data sheet. */
  still?: boolean
}

const symbols: Record<CurveMarker['kind'], { symbol: string; size: number }> = {
  stable: { symbol: 'circle', size: 11 },
  // an ink ring with a clear middle (unstableMarkerStyle; 'emptyCircle' would stroke in the fill colour)
  unstable: { symbol: 'circle', size: 11 },
  peak: { symbol: 'triangle', size: 12 },
  valley: { symbol: 'path://M0,0 L10,0 L5,9 Z', size: 12 },
}

function points(x: number[], y: number[]): Array<[number, number]> {
  const n = Math.min(x.length, y.length)
  const out: Array<[number, number]> = []
  for (let i = 0; i < n; i++) out.push([x[i], y[i]])
  return out
}

type RenderApi = { coord: (p: [number, number]) => [number, number] }

function polygonSeries(name: string, outline: Array<[number, number]>, fill: string, z: number): Record<string, unknown> {
  return {
    name,
    type: 'custom',
    silent: true,
    z,
    clip: true,
    data: outline.length ? [outline[0]] : [],
    tooltip: { show: false },
    renderItem: (_params: unknown, api: RenderApi) => ({
      type: 'polygon',
      shape: { points: outline.map((p) => api.coord(p)) },
      style: { fill },
      silent: true,
    }),
  }
}

export function configureChartOption(input: ConfigureChartInput): Record<string, unknown> {
  const { nominal, band, overlays, palette: p } = input
  const axes: Axes = nominal?.axes ?? { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } }
  const yUnit = axes.force.unit
  const xs = nominal?.displacement ?? []
  const xMin = xs.length ? Math.min(...xs) : 0
  const xMax = xs.length ? Math.max(...xs) : 1
  const xStep = niceStep(xMax - xMin)
  const series: Array<Record<string, unknown>> = []
  const legend: string[] = []
  // the force axis holds the curves and every finite force bound of the window
  const yExtent = niceExtent([
    ...(nominal?.force ?? []), ...(band?.low ?? []), ...(band?.high ?? []),
    ...overlays.filter((o) => o.kind === 'force-range').flatMap((o) => [o.min, o.max]).filter((v): v is number => v !== null),
  ])

  // window: stiffness wedges as polygons under everything, force and travel ranges as mark areas
  for (const o of overlays.filter((o) => o.kind === 'slope-range')) {
    const lo = o.min ?? 0
    const hi = o.max ?? Math.max(lo * 3, lo + 1)
    series.push({ ...polygonSeries(o.label, [[0, 0], [xMax, lo * xMax], [xMax, hi * xMax]], p.windowBand, 0), itemStyle: { color: p.window } })
    legend.push(o.label)
  }

  if (band) {
    const bandName = input.bandLabel ?? 'Tolerance band'
    series.push({ ...polygonSeries(bandName, bandPolygon(band), withAlpha(p.secondary, 0.2), 1), itemStyle: { color: withAlpha(p.secondary, 0.35) } })
    const edge = { type: 'line', showSymbol: false, silent: true, z: 2, lineStyle: { color: withAlpha(p.secondary, 0.55), width: 1, type: 'dashed' }, itemStyle: { color: p.secondary } }
    series.push({ ...edge, name: 'Tolerance low', data: points(band.displacement, band.low) })
    series.push({ ...edge, name: 'Tolerance high', data: points(band.displacement, band.high) })
    legend.push(bandName)
  }

  if (nominal) {
    const markData = input.markers
      .filter((m) => m.kind === 'stable' || m.kind === 'unstable' || m.kind === 'peak' || m.kind === 'valley')
      .map((m) => ({
        name: markerLabels[m.kind],
        coord: [m.x, m.y],
        symbol: symbols[m.kind].symbol,
        symbolSize: symbols[m.kind].size,
        itemStyle: m.kind === 'unstable' ? unstableMarkerStyle(p) : { color: p.ink, borderColor: p.ink, borderWidth: 0 },
        label: {
          show: m.kind === 'peak' || m.kind === 'valley',
          formatter: `${formatNumber(m.y)} ${yUnit}`,
          position: m.kind === 'valley' ? 'bottom' : 'top',
          color: p.ink, fontFamily, fontSize: 12, fontWeight: 500, distance: 8,
        },
      }))
    // an open side runs past the axis end and is clipped there (echarts' 'min'/'max' would stop at the data)
    const [y0, y1] = yExtent
    const far = (y1 - y0) * 10
    const areas: unknown[] = []
    for (const o of overlays) {
      if (o.kind === 'force-range') areas.push([{ yAxis: o.min ?? y0 - far, name: o.label }, { yAxis: o.max ?? y1 + far }])
      if (o.kind === 'displacement-range') areas.push([{ xAxis: o.min ?? xMin - (xMax - xMin) * 10, name: o.label }, { xAxis: o.max ?? xMax + (xMax - xMin) * 10 }])
    }
    const slopeLines = overlays.filter((o) => o.kind === 'slope-range').flatMap((o) => [o.min, o.max].filter((k): k is number => k !== null).map((k) => [
      { coord: [0, 0] }, { coord: [xMax, k * xMax] },
    ]))
    series.push({
      name: 'Nominal',
      type: 'line',
      data: points(nominal.displacement, nominal.force),
      showSymbol: false,
      lineStyle: { color: p.secondary, width: 2.5 },
      itemStyle: { color: p.secondary },
      z: 4,
      markPoint: { data: markData, animation: false },
      markLine: {
        silent: true, symbol: 'none', animation: false,
        label: { show: false },
        data: [
          { yAxis: 0, lineStyle: { color: p.line, type: 'solid', width: 1 } },
          ...slopeLines.map((pair) => pair.map((end, i) => (i === 0 ? { ...end, lineStyle: { color: p.window, type: 'dashed', width: 1.2 } } : end))),
        ],
      },
      markArea: areas.length ? {
        silent: true,
        itemStyle: { color: p.windowBand, borderColor: p.window, borderWidth: 0 },
        label: { show: true, position: 'insideTopRight', color: p.window, fontFamily, fontSize: 11 },
        data: areas,
      } : undefined,
    })
    legend.unshift('Nominal')
  }

  const axisCommon = valueAxisStyle(p)

  return {
    backgroundColor: 'transparent',
    animation: false,
    textStyle: { fontFamily, color: p.ink },
    grid: { left: 64, right: 52, top: 40, bottom: 52 },
    legend: {
      data: legend,
      top: 0,
      right: 8,
      textStyle: { color: p.inkMuted, fontFamily, fontSize: 12 },
      itemWidth: 22,
      itemHeight: 8,
      selectedMode: false,
    },
    tooltip: input.still ? { show: false } : {
      trigger: 'axis',
      backgroundColor: p.surface,
      borderColor: p.line,
      textStyle: { color: p.ink, fontFamily, fontSize: 12 },
      axisPointer: { type: 'line', lineStyle: { color: p.inkMuted, type: 'dashed' } },
      valueFormatter: (v: number) => `${formatNumber(v)} ${yUnit}`,
    },
    xAxis: { ...axisCommon, type: 'value', name: axisName(axes.displacement), nameGap: 32, min: xMin, max: xMax, interval: xStep, axisLabel: { ...axisCommon.axisLabel, showMaxLabel: showLastLabel(xMin, xMax, xStep) } },
    yAxis: { ...axisCommon, type: 'value', name: axisName(axes.force), nameGap: 46, min: yExtent[0], max: yExtent[1], interval: niceStep(yExtent[1] - yExtent[0]) },
    series,
  }
}
