import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ReportCard from '../ReportCard.vue'
import type { TestReport } from '@/api/curation'

const axes = { displacement: { key: 'displacement', label: 'Displacement', unit: 'mm' }, force: { key: 'force', label: 'Force', unit: 'N' } } as never
const curve = (n: number) => ({ displacement: Array.from({ length: n }, (_, i) => i / n), force: Array.from({ length: n }, (_, i) => i) })
const report = (drawn: number, points: number) => ({
  id: 7, revisionId: 1, status: 'submitted', uploader: { id: 2, displayName: 'A. Contributor' }, reviewer: null, originalName: 'run.csv',
  hasPhoto: false, printer: 'Bench printer', material: 'petg', lot: '', orientation: 'flat', testSpeed: null, notes: '', reviewNote: '',
  reviewedAt: null, measuredCurve: curve(drawn), points, createdAt: '2026-12-02T10:00:00.000Z', comparison: null, comparisonProblem: null,
}) as unknown as TestReport
const mountCard = (r: TestReport) => mount(ReportCard, { props: { report: r, axes, revisionNumber: 1, materialName: (id: string) => id, isLibrarian: false, busy: false } })

describe('ReportCard', () => {
  it('says a long curve is drawn from a preview and asks for every point on request', async () => {
    const wrapper = mountCard(report(400, 3000))
    expect(wrapper.find('.thinned').text()).toContain('Drawn with 400 of its 3,000 points')
    const button = wrapper.findAll('button').find((b) => b.text() === 'Draw every point')!
    await button.trigger('click')
    expect(wrapper.emitted('drawAll')).toHaveLength(1)
  })
  it('says nothing when every point is drawn', () => {
    expect(mountCard(report(120, 120)).find('.thinned').exists()).toBe(false)
  })
})
