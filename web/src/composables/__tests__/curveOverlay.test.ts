import { describe, expect, it } from 'vitest'
import { markerInterval, overlayChartOption, overlaySeries, reportOverlayCurves, type OverlayCurve } from '../curveOverlay'
import { historyCurves, historyPair } from '../history'
import { reviewCurves } from '../useReview'
import { palettes } from '@/theme/tokens'

const line = (k: number) => ({ displacement: [0, 1, 2], force: [0, k, 2 * k] })
const revisions = [
  { id: 11, number: 1, curve: line(1) },
  { id: 12, number: 2, curve: line(2) },
]
const report = (id: number, status: 'submitted' | 'accepted' | 'rejected', revisionId = 12) => ({ id, revisionId, status, printer: 'Bench B2', measuredCurve: line(1.8) })

describe('reportOverlayCurves', () => {
  it('draws the tested revision, accepted reports, and pending ones only when asked', () => {
    const reports = [report(3, 'submitted'), report(1, 'accepted'), report(2, 'rejected')]
    const forEngineer = reportOverlayCurves(revisions, reports, { includePending: false, currentRevisionId: 12 })
    expect(forEngineer.map((c) => [c.id, c.role])).toEqual([['predicted-12', 'predicted'], ['report-1', 'measured']])
    const forLibrarian = reportOverlayCurves(revisions, reports, { includePending: true, currentRevisionId: 12 })
    expect(forLibrarian.map((c) => c.id)).toEqual(['predicted-12', 'report-1', 'report-3'])
    expect(forLibrarian[2]).toMatchObject({ role: 'pending', label: 'Pending: report 3, Bench B2' })
    expect(forLibrarian[1].label).toBe('Report 1, Bench B2')
  })

  it("shows a contributor their own pending report, not others'", () => {
    const reports = [{ ...report(3, 'submitted'), uploader: 7 }, { ...report(4, 'submitted'), uploader: 8 }]
    const observed = reportOverlayCurves(revisions, reports, { includePending: (r) => r.uploader === 7, currentRevisionId: 12 })
    expect(observed.map((c) => c.id)).toEqual(['predicted-12', 'report-3'])
  })

  it('draws the prediction of every revision a shown report tested, oldest first', () => {
    const observed = reportOverlayCurves(revisions, [report(1, 'accepted', 12), report(2, 'accepted', 11)], { includePending: false, currentRevisionId: 12 })
    expect(observed.filter((c) => c.role === 'predicted').map((c) => c.label)).toEqual(['Predicted, revision 1', 'Predicted, revision 2'])
  })

  it('shows the current prediction alone before any report', () => {
    expect(reportOverlayCurves(revisions, [], { includePending: true, currentRevisionId: 11 }).map((c) => c.id)).toEqual(['predicted-11'])
    expect(reportOverlayCurves(revisions, [], { includePending: true, currentRevisionId: null })).toEqual([])
  })
})

describe('overlaySeries', () => {
  const p = palettes.light
  const curves: OverlayCurve[] = [
    { id: 'p', label: 'Predicted', role: 'predicted', curve: line(1) },
    { id: 'm1', label: 'Report 1', role: 'measured', curve: line(0.9) },
    { id: 'm2', label: 'Report 2', role: 'measured', curve: line(0.8) },
    { id: 's', label: 'Pending', role: 'pending', curve: line(0.7) },
  ]

  it('pairs points and never uses the force-window accent', () => {
    const observed = overlaySeries(curves, p)
    expect(observed[0].data).toEqual([[0, 0], [1, 1], [2, 2]])
    const colours = JSON.stringify(observed)
    expect(colours).not.toContain(p.window)
    expect(colours).not.toContain(palettes.dark.window)
  })

  it('tells measured curves apart by dash and marker, and draws pending ones faint and dashed', () => {
    const [, m1, m2, pending] = overlaySeries(curves, p) as Array<{ lineStyle: { type: unknown; color: string }; symbol: string }>
    expect(m1.lineStyle.type).not.toEqual(m2.lineStyle.type)
    expect(m1.symbol).not.toBe(m2.symbol)
    expect(pending.lineStyle.color).toBe(p.stored)
    expect(Array.isArray(pending.lineStyle.type)).toBe(true)
  })

  it('puts a zero line under the first series and names the axes with units', () => {
    const option = overlayChartOption({ curves, axes: { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } }, palette: p }) as { series: Array<Record<string, unknown>>; xAxis: { name: string } }
    expect(option.series[0].markLine).toBeTruthy()
    expect(option.xAxis.name).toBe('Displacement (mm)')
  })

  it('thins markers on a dense curve', () => {
    expect(markerInterval(10)).toBe(0)
    expect(markerInterval(140)).toBe(9)
  })
})

describe('history', () => {
  it('compares the revision before the current one with the current one', () => {
    expect(historyPair([...revisions, { id: 13, number: 3, curve: line(3) }], 12)).toEqual({ a: 11, b: 12 })
    expect(historyPair(revisions, null)).toEqual({ a: 11, b: 12 })
    expect(historyPair([revisions[0]], 11)).toEqual({ a: 11, b: 11 })
  })

  it('draws the older revision under the newer whichever way they were picked', () => {
    const observed = historyCurves(revisions[1], revisions[0])
    expect(observed.map((c) => [c.label, c.role])).toEqual([['Revision 1', 'before'], ['Revision 2', 'after']])
    expect(historyCurves(revisions[0], revisions[0])).toEqual([])
  })
})

describe('reviewCurves', () => {
  it('puts the current revision under the proposed curve; a new entry has only its own', () => {
    expect(reviewCurves({ against: { id: 11, number: 1, entryId: 1 }, curves: { a: { ...line(1), axes: {} as never }, b: { ...line(2), axes: {} as never } } }).map((c) => [c.label, c.role]))
      .toEqual([['Current, revision 1', 'before'], ['Proposed', 'after']])
    expect(reviewCurves({ against: null, curves: { a: null, b: { ...line(2), axes: {} as never } } }).map((c) => c.id)).toEqual(['proposed'])
    expect(reviewCurves(null)).toEqual([])
  })
})
