/**
 * Curation routes (docs/api.md, "Curation" and "Test reports"): drafts and change proposals,
 * review decisions, diffs, test reports, calibration and the outbox. One function per route.
 */
import { request, requestBlob } from './client'
import type { CurveComparison } from '@catalog/calibration'
import type { Curve, Entry, EntryStatus, EntrySummary, Material, MetricValue, ParamRanges, PersonRef, Revision } from './types'

export type { CurveComparison }

export type CommentKind = 'comment' | 'changes_requested' | 'rejected'

export interface EntryComment {
  id: number
  kind: CommentKind
  text: string
  author: PersonRef | null
  createdAt: string
}

export type ReportStatus = 'submitted' | 'accepted' | 'rejected'

export interface ReportComparison extends CurveComparison {
  revisionId: number
  revisionNumber: number
  predictedMaterial: { id: string | null; name: string; modulus: number }
}

export interface TestReport {
  id: number
  revisionId: number | null
  status: ReportStatus
  uploader: PersonRef | null
  reviewer: PersonRef | null
  originalName: string
  hasPhoto: boolean
  printer: string
  material: string
  lot: string
  orientation: string
  /** mm/min */
  testSpeed: number | null
  notes: string
  reviewNote: string
  reviewedAt: string | null
  /** A preview of at most 400 points (peaks kept) for drawing; the whole curve: GET /api/reports/:id/curve. */
  measuredCurve: { displacement: number[]; force: number[] }
  /** Points in the whole measured curve. */
  points: number
  createdAt: string
  comparison: ReportComparison | null
  comparisonProblem: string | null
}

/** A report as the review queue and the report routes send it: with the entry it belongs to. */
export interface TestReportWithEntry extends TestReport {
  entry: { id: number; name: string; familyId: string }
}

/** GET /api/entries/:id as the curation server sends it. */
export interface EntryDetail extends Omit<Entry, 'reports'> {
  proposalForId: number | null
  reports: TestReport[]
  comments: EntryComment[]
  proposalFor: { id: number; name: string; status: EntryStatus; currentRevisionId: number | null } | null
  proposals: Array<EntrySummary & { proposalForId: number | null }>
}

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

export interface EntryDiff {
  entryId: number
  against: { id: number; number: number; entryId: number } | null
  params: Array<DiffRow<number | string>>
  ranges: Array<DiffRow<[number, number]>>
  metrics: MetricDiffRow[]
  fields: Array<{ field: 'name' | 'summary' | 'tags' | 'materials' | 'notes'; a: unknown; b: unknown; changed: boolean }>
  curves: { a: Curve | null; b: Curve | null }
  method: string | null
  warnings: string[]
  evaluationProblem: string | null
}

export interface RevisionComparison {
  entryId: number
  a: Revision
  b: Revision
  params: Array<DiffRow<number | string>>
  ranges: Array<DiffRow<[number, number]>>
  metrics: MetricDiffRow[]
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

export interface CalibrationGroup {
  printer: string
  material: string
  count: number
  moduli: Array<{ reportId: number; modulus: number }>
  mean: number
  standardDeviation: number | null
  range: number
  min: number
  max: number
}

export interface EntryCalibration {
  entryId: number
  groups: CalibrationGroup[]
  reports: Array<{ reportId: number; revisionId: number | null; printer: string; material: string; lot: string; modulus: number; predictedModulus: number; predictedMaterial: ReportComparison['predictedMaterial'] }>
  unfitted: Array<{ reportId: number; reason: string }>
}

export interface ReviewQueue {
  entries: Array<{ entry: EntryDetail; diff: EntryDiff }>
  reports: TestReportWithEntry[]
  /** The page shown (limit, offset) and how many wait in all. */
  page: { limit: number; offset: number; totalEntries: number; totalReports: number }
}

export interface OutboxMessage {
  id: number
  to: string[]
  subject: string
  text: string
  at: string
  transport: string
  status: 'sent' | 'failed' | string
  error: string | null
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
  reviewQueue: () => request<ReviewQueue>('GET', '/api/review-queue'),
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
  file: (reportId: number) => requestBlob(`/api/reports/${id(reportId)}/file`),
  photo: (reportId: number) => requestBlob(`/api/reports/${id(reportId)}/photo`),
}
