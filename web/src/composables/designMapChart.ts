/** The echarts option for a design-space map, from plain data (tested without a canvas). */
import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { axisName } from './chartAxes'
import type { DesignMap } from './designMap'
import { formatNumber } from './metrics'

interface MapAxisInfo {
  key: string
  label: string
  unit: string
}

export interface DesignMapChartInput {
  map: DesignMap
  metric: MapAxisInfo
  x: MapAxisInfo
  y: MapAxisInfo
  /** The current configuration's cell, pinned. */
  pinned: { i: number; j: number } | null
  palette: Palette
  mode: 'light' | 'dark'
}

/** Sequential ramp for the metric: neutral slate, so the accent keeps meaning "inside the window". */
const RAMPS = {
  light: ['#F1EFE6', '#C9D3D6', '#8FA6B3', '#4F6A7B', '#22323D'],
  dark: ['#1E262B', '#34464F', '#557282', '#8EAFC0', '#D5E3EA'],
}

/** Which sides of each meeting cell border a cell that does not meet: the outline of the region. */
export function regionEdges(map: Pick<DesignMap, 'size' | 'meets'>): Array<[number, number, number]> {
  const n = map.size
  const at = (i: number, j: number) => i >= 0 && j >= 0 && i < n && j < n && map.meets[j * n + i]
  const out: Array<[number, number, number]> = []
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      if (!at(i, j)) continue
      // bits: 1 left, 2 right, 4 below, 8 above
      const mask = (at(i - 1, j) ? 0 : 1) | (at(i + 1, j) ? 0 : 2) | (at(i, j - 1) ? 0 : 4) | (at(i, j + 1) ? 0 : 8)
      if (mask) out.push([i, j, mask])
    }
  }
  return out
}

export function designMapOption(input: DesignMapChartInput): Record<string, unknown> {
  const { map, metric, x, y, palette: p } = input
  const n = map.size
  const values = map.values[metric.key] ?? []
  const ok: Array<[number, number, number]> = []
  const apart: Array<[number, number, number]> = []
  let lo = Infinity
  let hi = -Infinity
  for (let c = 0; c < n * n; c++) {
    const i = c % n
    const j = Math.floor(c / n)
    const v = values[c]
    if (map.state[c] === 'monostable') apart.push([i, j, 0])
    else if (map.state[c] === 'ok' && typeof v === 'number') {
      ok.push([i, j, v])
      if (v < lo) lo = v
      if (v > hi) hi = v
    }
  }
  if (!(hi > lo)) { lo = Number.isFinite(lo) ? lo - 1 : 0; hi = lo + 2 }
  const edges = regionEdges(map)
  const axis = (a: MapAxisInfo, data: number[]) => ({
    type: 'category',
    data: data.map((v) => formatNumber(v, 3)),
    name: axisName(a),
    nameLocation: 'middle',
    nameGap: 30,
    nameTextStyle: { color: p.inkMuted, fontFamily, fontSize: 12 },
    axisLine: { lineStyle: { color: p.line } },
    axisTick: { show: false },
    axisLabel: { color: p.inkMuted, fontFamily, fontSize: 11, interval: Math.ceil(n / 6) - 1 },
    splitArea: { show: false },
  })
  const cellInfo = (i: number, j: number) => {
    const c = j * n + i
    const v = values[c]
    const state = map.state[c] === 'monostable' ? 'Springs back: one stable position' : map.state[c] === 'invalid' ? 'Outside the model or a rule' : map.meets[c] ? 'Meets the window over the tolerance band' : map.hasWindow ? 'Misses the window' : ''
    return [
      `${x.label} ${formatNumber(map.xs[i], 4)} ${x.unit}`,
      `${y.label} ${formatNumber(map.ys[j], 4)} ${y.unit}`,
      `${metric.label} ${typeof v === 'number' ? `${formatNumber(v)} ${metric.unit}` : '—'}`,
      state,
    ].filter(Boolean).join('<br>')
  }
  return {
    backgroundColor: 'transparent',
    animation: false,
    textStyle: { fontFamily, color: p.ink },
    grid: { left: 58, right: 88, top: 12, bottom: 46 },
    tooltip: {
      trigger: 'item',
      backgroundColor: p.surface,
      borderColor: p.line,
      textStyle: { color: p.ink, fontFamily, fontSize: 12 },
      formatter: (item: { data: [number, number, number] }) => cellInfo(item.data[0], item.data[1]),
    },
    xAxis: axis(x, map.xs),
    yAxis: { ...axis(y, map.ys), nameGap: 44 },
    visualMap: {
      type: 'continuous',
      seriesIndex: 0,
      min: lo,
      max: hi,
      calculable: false,
      orient: 'vertical',
      right: 4,
      top: 'middle',
      itemHeight: 180,
      itemWidth: 12,
      precision: 2,
      text: [`${formatNumber(hi)} ${metric.unit}`, `${formatNumber(lo)} ${metric.unit}`],
      textStyle: { color: p.inkMuted, fontFamily, fontSize: 11 },
      inRange: { color: RAMPS[input.mode] },
      formatter: (v: number) => formatNumber(v),
    },
    series: [
      { name: metric.label, type: 'heatmap', data: ok, progressive: 0, emphasis: { itemStyle: { borderColor: p.ink, borderWidth: 1 } } },
      {
        name: 'One stable position',
        type: 'heatmap',
        data: apart,
        progressive: 0,
        itemStyle: { color: p.stored, opacity: 0.55, decal: { symbol: 'rect', dashArrayX: [1, 0], dashArrayY: [2, 3], rotation: Math.PI / 4, color: p.surface } },
      },
      {
        name: 'Meets the window',
        type: 'custom',
        silent: true,
        data: edges,
        z: 10,
        renderItem: (_params: unknown, api: { value: (d: number) => number; coord: (v: number[]) => number[]; size: (v: number[]) => number[] }) => {
          const [cx, cy] = api.coord([api.value(0), api.value(1)])
          const [w, h] = api.size([1, 1])
          const mask = api.value(2)
          const l = cx - w / 2, r = cx + w / 2, t = cy - h / 2, b = cy + h / 2
          const seg = (x1: number, y1: number, x2: number, y2: number) => ({ type: 'line', shape: { x1, y1, x2, y2 }, style: { stroke: p.window, lineWidth: 2 } })
          const children = []
          if (mask & 1) children.push(seg(l, t, l, b))
          if (mask & 2) children.push(seg(r, t, r, b))
          if (mask & 4) children.push(seg(l, b, r, b))
          if (mask & 8) children.push(seg(l, t, r, t))
          return { type: 'group', children }
        },
      },
      {
        name: 'This configuration',
        type: 'scatter',
        data: input.pinned ? [[input.pinned.i, input.pinned.j]] : [],
        symbol: 'circle',
        symbolSize: 13,
        itemStyle: { color: 'transparent', borderColor: p.ink, borderWidth: 2.5 },
        z: 12,
        tooltip: { formatter: () => `This configuration<br>${input.pinned ? cellInfo(input.pinned.i, input.pinned.j) : ''}` },
      },
    ],
  }
}
