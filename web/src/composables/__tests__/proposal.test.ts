import { describe, expect, it } from 'vitest'
import { aboutOf, draftBody, lockReason, sortDraftIssues, withoutFieldPrefix } from '../proposal'
import { sortProposals } from '../useMyProposals'
import { unitChoices } from '../useReportUpload'
import type { ParamSpec } from '@/api/types'

const params: ParamSpec[] = [
  { key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 1, help: '' },
  { key: 'thickness', label: 'Thickness', unit: 'mm', default: 0.6, min: 0.3, max: 2, step: 0.05, help: '' },
]

describe('draftBody', () => {
  it('trims text, drops empty and repeated tags, sends narrowed ranges only and the material with the parameters', () => {
    const about = { ...aboutOf(null), name: '  Lid hinge  ', tags: ['lid', ' lid', '', 'hinge'], materials: ['petg'] }
    const observed = draftBody(params, about, { values: { span: 40, thickness: null }, material: 'petg' }, { span: { min: 10, max: 120 }, thickness: { min: 0.4, max: 1 } })
    expect(observed).toEqual({ name: 'Lid hinge', summary: '', tags: ['lid', 'hinge'], defaultParams: { span: 40, material: 'petg' }, ranges: { thickness: [0.4, 1] }, materials: ['petg'], notes: '' })
  })
})

describe('sortDraftIssues', () => {
  it('puts each server issue where the form shows it, without repeating the field name', () => {
    const observed = sortDraftIssues([
      { field: 'name', message: 'name is required' },
      { field: 'ranges.span', message: "ranges.span: [5, 50] must lie inside the family's own range 10–120 mm" },
      { field: 'defaultParams.thickness', message: 'defaultParams.thickness: Thickness must be at most 2 mm' },
      { field: 'defaultParams', message: 'defaultParams: apex height must be well below the span' },
      { field: 'materials.1', message: 'materials.1: unknown material "xyz"' },
    ], ['span', 'thickness'])
    expect(observed.about).toEqual({ name: 'name is required', materials: 'materials.1: unknown material "xyz"' })
    expect(observed.ranges).toEqual({ 'ranges.span': "[5, 50] must lie inside the family's own range 10–120 mm" })
    expect(observed.params).toEqual({ thickness: 'Thickness must be at most 2 mm' })
    expect(observed.general).toEqual(['defaultParams: apex height must be well below the span'])
  })

  it('leaves a message without the prefix alone', () => {
    expect(withoutFieldPrefix({ field: 'span', message: 'Span is needed' })).toBe('Span is needed')
  })
})

describe('lockReason', () => {
  const owner = { id: 7, displayName: 'Bram' }
  it('lets the owner edit a draft only', () => {
    expect(lockReason({ status: 'draft', owner }, 7)).toBeNull()
    expect(lockReason({ status: 'in_review', owner }, 7)).toMatch(/Submitted for review/)
    expect(lockReason({ status: 'draft', owner }, 8)).toMatch(/Only the contributor/)
    expect(lockReason(null, 7)).toBeNull()
  })
})

describe('sortProposals', () => {
  it('puts drafts first, then what is in review, then the record, newest first within each', () => {
    const rows = [
      { id: 1, status: 'released' as const, updatedAt: '2026-11-02' },
      { id: 2, status: 'draft' as const, updatedAt: '2026-11-01' },
      { id: 3, status: 'in_review' as const, updatedAt: '2026-11-03' },
      { id: 4, status: 'draft' as const, updatedAt: '2026-11-04' },
    ]
    expect(sortProposals(rows).map((r) => r.id)).toEqual([4, 2, 3, 1])
  })
})

describe('unitChoices', () => {
  it('offers mm or in and N, gf or lbf for displacement curves, deg and N·mm for rotation', () => {
    expect(unitChoices({ displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } })).toEqual({ displacement: ['mm', 'in'], force: ['N', 'gf', 'lbf'] })
    expect(unitChoices({ displacement: { label: 'Rotation', unit: 'deg' }, force: { label: 'Moment', unit: 'N·mm' } })).toEqual({ displacement: ['deg'], force: ['N·mm'] })
  })
})
