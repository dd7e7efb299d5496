/**
 * Several curves in one plot: the predicted curve with measured ones over it, or two
 * revisions (or a proposal and the current revision) compared. Built from plain data so it
 * is tested without a canvas. The force-window accent is never used here: overlays tell
 * curves apart by line weight, dash and marker, in the neutral colours.
 */
import type { AxisSpec } from '@/api/types'
import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { axisName, valueAxisStyle } from './chartAxes'
import { formatNumber } from './metrics'

/**
 * - `predicted`: the model's curve for the revision a report tested
 * - `measured`: an accepted test report
 * - `pending`: a submitted report not reviewed yet (librarians only)
 * - `before` / `after`: the two sides of a comparison (older or current, newer or proposed)
 */
type OverlayRole = 'predicted' | 'measured' | 'pending' | 'before' | 'after'

export interface OverlayCurve {
  id: string
  label: string
  role: OverlayRole
  curve: { displacement: readonly number[]; force: readonly number[] }
}

export interface OverlayAxes {
  displacement: AxisSpec
  force: AxisSpec
}

// measured curves after the first are told apart by dash and marker, not by hue
const MEASURED_DASHES: Array<'solid' | number[]> = ['solid', [7, 3], [2, 3], [10, 3, 2, 3]]
const MEASURED_SYMBOLS = ['circle', 'rect', 'triangle', 'diamond']

/** Every n-th point gets a marker so a dense measured curve stays readable. */
export function markerInterval(points: number, wanted = 14): number {
  return Math.max(0, Math.ceil(points / wanted) - 1)
}

export function overlaySeries(curves: readonly OverlayCurve[], palette: Palette): Array<Record<string, unknown>> {
  let measuredIndex = 0
  return curves.map((c) => {
    const data = c.curve.displacement.map((x, i) => [x, c.curve.force[i]])
    const base = { id: c.id, name: c.label, type: 'line', data, smooth: false, animation: false }
    switch (c.role) {
      case 'predicted':
        return { ...base, showSymbol: false, z: 2, lineStyle: { color: palette.secondary, width: 2.5, type: 'solid' }, itemStyle: { color: palette.secondary } }
      case 'after':
        return { ...base, showSymbol: false, z: 3, lineStyle: { color: palette.secondary, width: 2.5, type: 'solid' }, itemStyle: { color: palette.secondary } }
      case 'before':
        return { ...base, showSymbol: false, z: 2, lineStyle: { color: palette.inkMuted, width: 2, type: [6, 4] }, itemStyle: { color: palette.inkMuted } }
      case 'pending':
        return {
          ...base, z: 1, showSymbol: true, symbol: 'emptyCircle', symbolSize: 5, showAllSymbol: false,
          symbolInterval: markerInterval(data.length),
          lineStyle: { color: palette.stored, width: 1.5, type: [4, 4] }, itemStyle: { color: palette.stored, borderColor: palette.stored },
        }
      case 'measured': {
        const k = measuredIndex++ % MEASURED_DASHES.length
        return {
          ...base, z: 4, showSymbol: true, symbol: MEASURED_SYMBOLS[k], symbolSize: 5,
          symbolInterval: markerInterval(data.length),
          lineStyle: { color: palette.ink, width: 1.5, type: MEASURED_DASHES[k] }, itemStyle: { color: palette.ink },
        }
      }
    }
  })
}

export function overlayChartOption(input: { curves: readonly OverlayCurve[]; axes: OverlayAxes; palette: Palette }): Record<string, unknown> {
  const { axes, palette: p } = input
  const series = overlaySeries(input.curves, p)
  if (series.length) {
    // the zero-force line, drawn once, under everything
    series[0].markLine = { silent: true, symbol: 'none', label: { show: false }, lineStyle: { color: p.line, type: 'solid', width: 1 }, data: [{ yAxis: 0 }], animation: false }
  }
  const axisCommon = valueAxisStyle(p)
  return {
    backgroundColor: 'transparent',
    animation: false,
    textStyle: { fontFamily, color: p.ink },
    grid: { left: 64, right: 32, top: 44, bottom: 52 },
    legend: { show: true, top: 0, left: 8, textStyle: { color: p.inkMuted, fontFamily, fontSize: 12 }, itemWidth: 26, itemHeight: 8 },
    tooltip: {
      trigger: 'axis',
      backgroundColor: p.surface,
      borderColor: p.line,
      textStyle: { color: p.ink, fontFamily, fontSize: 12 },
      axisPointer: { type: 'line', lineStyle: { color: p.inkMuted, type: 'dashed' } },
      valueFormatter: (v: number) => `${formatNumber(v)} ${axes.force.unit}`,
    },
    xAxis: { ...axisCommon, type: 'value', name: axisName(axes.displacement), nameGap: 32, min: 'dataMin', max: 'dataMax' },
    yAxis: { ...axisCommon, type: 'value', name: axisName(axes.force), nameGap: 46 },
    series,
    aria: { enabled: true, label: { description: describeOverlay(input.curves) } },
  }
}

/** "Predicted curve, 2 measured curves (1 pending review)." for screen readers. */
export function describeOverlay(curves: readonly OverlayCurve[]): string {
  if (!curves.length) return 'No curves to show.'
  return curves.map((c) => c.label).join('; ') + '.'
}

interface ReportLike {
  id: number
  revisionId: number | null
  status: 'submitted' | 'accepted' | 'rejected'
  printer: string
  measuredCurve: { displacement: readonly number[]; force: readonly number[] }
}

interface RevisionLike {
  id: number
  number: number
  curve: { displacement: readonly number[]; force: readonly number[] }
}

/**
 * The entry page's overlay: the predicted curve of every revision a shown report tested
 * (the current one when there is no report yet), then accepted reports, then submitted
 * ones marked as pending (for librarians all of them, for a contributor their own). Rejected reports are never drawn.
 */
export function reportOverlayCurves<R extends ReportLike>(revisions: readonly RevisionLike[], reports: readonly R[], options: { includePending: boolean | ((report: R) => boolean); currentRevisionId: number | null }): OverlayCurve[] {
  const pending = (r: R) => (typeof options.includePending === 'function' ? options.includePending(r) : options.includePending)
  const shown = reports.filter((r) => r.status === 'accepted' || (r.status === 'submitted' && pending(r)))
  const tested = new Set(shown.map((r) => r.revisionId).filter((id): id is number => id !== null))
  if (!tested.size && options.currentRevisionId !== null) tested.add(options.currentRevisionId)
  const predicted = revisions
    .filter((rev) => tested.has(rev.id))
    .sort((a, b) => a.number - b.number)
    .map((rev): OverlayCurve => ({ id: `predicted-${rev.id}`, label: `Predicted, revision ${rev.number}`, role: 'predicted', curve: rev.curve }))
  const measured = shown
    .sort((a, b) => (a.status === b.status ? a.id - b.id : a.status === 'accepted' ? -1 : 1))
    .map((r): OverlayCurve => ({
      id: `report-${r.id}`,
      label: `${r.status === 'submitted' ? 'Pending: report' : 'Report'} ${r.id}${r.printer ? `, ${r.printer}` : ''}`,
      role: r.status === 'submitted' ? 'pending' : 'measured',
      curve: r.measuredCurve,
    }))
  return [...predicted, ...measured]
}
