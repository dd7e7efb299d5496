/**
 * Curation routes (docs/api.md, "Curation" and "Test reports"): drafts and change proposals,
 * review decisions, diffs, test reports, calibration and the outbox. One function per route.
 */
import type { z } from 'zod'
import type * as contract from '@contract/api'
import { request, requestBlob } from './client'
import type { EntrySummary, Material, MetricValue, ParamRanges } from './types'

// The answers' shapes come from the wire contract (contract/api.ts), type-only.
export type EntryComment = z.infer<typeof contract.EntryComment>
export type TestReport = z.infer<typeof contract.TestReport>
export type TestReportWithEntry = z.infer<typeof contract.TestReportWithEntry>
export type EntryDetail = z.infer<typeof contract.EntryDetail>
export type EntryDiff = z.infer<typeof contract.EntryDiff>
export type RevisionComparison = z.infer<typeof contract.RevisionComparison>
export type EntryCalibration = z.infer<typeof contract.EntryCalibration>
export type ReviewQueue = z.infer<typeof contract.ReviewQueue>
export type OutboxMessage = z.infer<typeof contract.OutboxMessage>
export type ReportCurve = z.infer<(typeof contract.responseContract)['GET /api/reports/:id/curve']>

export type ProposalSummary = EntrySummary & { proposalForId?: number | null }

/** One side-by-side row of a diff: `a` the revision, `b` the other side. */
export interface DiffRow<T> {
  key: string
  label: string
  unit: string
  a: T | null
  b: T | null
  changed: boolean
}

export interface MetricDiffRow extends DiffRow<MetricValue> {
  difference: number | null
}

/** The body of a draft or a change proposal (POST /api/entries, PATCH, proposals). */
export interface DraftBody {
  name: string
  summary: string
  tags: string[]
  defaultParams: Record<string, number | string>
  ranges: ParamRanges
  materials: string[]
  notes: string
}

/** The fields of an upload besides the files (multipart text fields, docs/api.md). */
export interface ReportUploadFields {
  revisionId?: number
  printer: string
  material: string
  lot: string
  orientation: string
  testSpeed: number | null
  notes: string
  displacementColumn?: string
  forceColumn?: string
  displacementUnit: string
  forceUnit: string
  hasHeader: 'auto' | 'yes' | 'no'
}

const id = (value: number | string) => encodeURIComponent(String(value))

export const curationApi = {
  show: (entryId: number | string) => request<{ entry: EntryDetail }>('GET', `/api/entries/${id(entryId)}`).then((r) => r.entry),
  createDraft: (family: string, body: DraftBody) => request<{ entry: EntryDetail }>('POST', '/api/entries', { body: { family, ...body } }).then((r) => r.entry),
  updateDraft: (entryId: number, body: Partial<DraftBody>) => request<{ entry: EntryDetail }>('PATCH', `/api/entries/${id(entryId)}`, { body }).then((r) => r.entry),
  proposeChange: (entryId: number, body: Partial<DraftBody>) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/proposals`, { body }).then((r) => r.entry),
  comment: (entryId: number, text: string) => request<{ comment: EntryComment }>('POST', `/api/entries/${id(entryId)}/comments`, { body: { text } }).then((r) => r.comment),
  submit: (entryId: number) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/submit`, { body: {} }).then((r) => r.entry),
  release: (entryId: number) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/release`, { body: {} }).then((r) => r.entry),
  reject: (entryId: number, reason: string) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/reject`, { body: { reason } }).then((r) => r.entry),
  requestChanges: (entryId: number, comment: string) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/request-changes`, { body: { comment } }).then((r) => r.entry),
  retire: (entryId: number, reason?: string) => request<{ entry: EntryDetail }>('POST', `/api/entries/${id(entryId)}/retire`, { body: reason ? { reason } : {} }).then((r) => r.entry),
  diff: (entryId: number, against?: number) =>
    request<{ diff: EntryDiff }>('GET', `/api/entries/${id(entryId)}/diff${against ? `?against=${against}` : ''}`).then((r) => r.diff),
  compareRevisions: (entryId: number, a: number, b: number) =>
    request<{ comparison: RevisionComparison }>('GET', `/api/entries/${id(entryId)}/revisions/compare?a=${a}&b=${b}`).then((r) => r.comparison),
  reviewQueue: (page: { limit?: number; offset?: number } = {}) => {
    const query = new URLSearchParams()
    if (page.limit) query.set('limit', String(page.limit))
    if (page.offset) query.set('offset', String(page.offset))
    const q = query.toString()
    return request<ReviewQueue>('GET', `/api/review-queue${q ? `?${q}` : ''}`)
  },
  outbox: () => request<{ messages: OutboxMessage[] }>('GET', '/api/outbox').then((r) => r.messages),
}

/** The multipart body of an upload: text fields as the server reads them, then the files. */
export function reportFormData(fields: ReportUploadFields, file: File, photo?: File | null): FormData {
  const data = new FormData()
  if (fields.revisionId) data.append('revisionId', String(fields.revisionId))
  data.append('printer', fields.printer)
  data.append('material', fields.material)
  data.append('lot', fields.lot)
  data.append('orientation', fields.orientation)
  if (fields.testSpeed !== null) data.append('testSpeed', String(fields.testSpeed))
  data.append('notes', fields.notes)
  if (fields.displacementColumn) data.append('displacementColumn', fields.displacementColumn)
  if (fields.forceColumn) data.append('forceColumn', fields.forceColumn)
  data.append('displacementUnit', fields.displacementUnit)
  data.append('forceUnit', fields.forceUnit)
  data.append('hasHeader', fields.hasHeader)
  data.append('file', file, file.name)
  if (photo) data.append('photo', photo, photo.name)
  return data
}

export const reportsApi = {
  upload: (entryId: number, body: FormData) => request<{ report: TestReportWithEntry }>('POST', `/api/entries/${id(entryId)}/reports`, { body }).then((r) => r.report),
  accept: (reportId: number, note?: string) => request<{ report: TestReportWithEntry }>('POST', `/api/reports/${id(reportId)}/accept`, { body: note ? { note } : {} }).then((r) => r.report),
  reject: (reportId: number, note?: string) => request<{ report: TestReportWithEntry }>('POST', `/api/reports/${id(reportId)}/reject`, { body: note ? { note } : {} }).then((r) => r.report),
  adoptModulus: (reportId: number, name?: string) => request<{ material: Material }>('POST', `/api/reports/${id(reportId)}/adopt-modulus`, { body: name ? { name } : {} }).then((r) => r.material),
  calibration: (entryId: number) => request<{ calibration: EntryCalibration }>('GET', `/api/entries/${id(entryId)}/calibration`).then((r) => r.calibration),
  /** Every point of a measured curve (entry pages carry a preview of at most 400). */
  curve: (reportId: number) => request<ReportCurve>('GET', `/api/reports/${id(reportId)}/curve`),
  file: (reportId: number) => requestBlob(`/api/reports/${id(reportId)}/file`),
  photo: (reportId: number) => requestBlob(`/api/reports/${id(reportId)}/photo`),
}
