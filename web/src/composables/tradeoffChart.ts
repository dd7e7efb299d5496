/**
 * The trade-off scatter of a search answer: margin against strain safety (or footprint) for
 * every kept candidate, the results on the table's first page drawn solid, further results
 * lighter and close variants as small hollow points. Built from plain data so it is tested
 * without a canvas.
 */
import type { TradeoffPoint } from '@/api'
import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { valueAxisStyle } from './chartAxes'
import { formatNumber } from './metrics'

export type TradeoffAxis = 'safety' | 'footprint'

/** Rows on the results table's first page (SearchResultsTable's page size). */
export const FIRST_PAGE = 10

export type TradeoffGroup = 'first-page' | 'further' | 'variant'

export function groupOf(p: Pick<TradeoffPoint, 'position'>, firstPage = FIRST_PAGE): TradeoffGroup {
  if (p.position === null) return 'variant'
  return p.position <= firstPage ? 'first-page' : 'further'
}

const GROUP_NAMES: Record<TradeoffGroup, string> = {
  'first-page': 'Listed on the first page',
  further: 'Further results',
  variant: 'Close variants',
}

/** The horizontal value of a point, or null when it has none on that axis (not plotted). */
export function xOf(p: TradeoffPoint, axis: TradeoffAxis): number | null {
  return axis === 'safety' ? p.safetyFactor : p.footprint
}

function tradeoffTooltip(p: TradeoffPoint, materialName: (id: unknown) => string): string {
  const where = p.position !== null ? `result ${p.position}` : `close variant of result ${p.variantOf}`
  const safety = p.safetyFactor === null ? 'no strain reported' : formatNumber(p.safetyFactor)
  const footprint = p.footprint === null ? '—' : `${formatNumber(p.footprint, 3)} mm²`
  return [`${p.entryName} · ${materialName(p.params.material)}`, where, `margin ${formatNumber(p.margin * 100, 3)} %`, `strain safety ${safety}`, `footprint ${footprint}`].join('<br>')
}

interface Input {
  points: TradeoffPoint[]
  axis: TradeoffAxis
  palette: Palette
  materialName: (id: unknown) => string
}

export function tradeoffOption({ points, axis, palette: p, materialName }: Input): Record<string, unknown> {
  const groups: TradeoffGroup[] = ['variant', 'further', 'first-page']
  const style: Record<TradeoffGroup, Record<string, unknown>> = {
    // variants first so the listed points are drawn over them
    variant: { symbol: 'emptyCircle', symbolSize: 6, itemStyle: { color: p.stored, borderColor: p.stored, opacity: 0.9 } },
    further: { symbol: 'circle', symbolSize: 9, itemStyle: { color: p.secondary, opacity: 0.55, borderColor: p.surface, borderWidth: 1 } },
    'first-page': { symbol: 'circle', symbolSize: 12, itemStyle: { color: p.window, borderColor: p.surface, borderWidth: 1.5 } },
  }
  const series = groups.map((g) => ({
    type: 'scatter',
    name: GROUP_NAMES[g],
    ...style[g],
    emphasis: { scale: 1.4, itemStyle: { borderColor: p.ink, borderWidth: 2 } },
    cursor: 'pointer',
    data: points
      .map((pt, index) => ({ pt, index }))
      .filter(({ pt }) => groupOf(pt) === g && xOf(pt, axis) !== null)
      .map(({ pt, index }) => ({ value: [xOf(pt, axis), pt.margin * 100], index })),
  }))
  const xName = axis === 'safety' ? 'Strain safety factor (worst corner of the band)' : 'Footprint (mm²)'
  return {
    animation: false,
    textStyle: { fontFamily },
    aria: { enabled: true, label: { description: `Scatter of ${points.length} candidates: margin to the window against ${axis === 'safety' ? 'strain safety' : 'footprint'}.` } },
    grid: { left: 64, right: 24, top: 40, bottom: 52 },
    legend: { top: 4, left: 0, textStyle: { color: p.inkMuted, fontFamily, fontSize: 12 }, data: ['first-page', 'further', 'variant'].map((g) => GROUP_NAMES[g as TradeoffGroup]) },
    tooltip: {
      trigger: 'item',
      backgroundColor: p.surface, borderColor: p.line, textStyle: { color: p.ink, fontFamily, fontSize: 12 },
      formatter: (item: { data: { index: number } }) => tradeoffTooltip(points[item.data.index], materialName),
    },
    xAxis: { type: 'value', scale: true, name: xName, nameGap: 32, ...valueAxisStyle(p) },
    yAxis: { type: 'value', scale: true, name: 'Margin to the window (%)', nameGap: 44, ...valueAxisStyle(p) },
    series,
  }
}
