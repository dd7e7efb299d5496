/** Shelf entries as each role may see them (docs/api.md, "GET /api/entries"). */
import { Op, type WhereOptions } from 'sequelize'
import { families } from '../../catalog'
import type { AppContext } from '../context'
import type { Entry, EntryRevision, TestReport, User } from '../db'
import { notFound } from '../errors'
import { hasRole } from '../roles'
import { listMaterials } from './materials'
import { compareReport, type MaterialNumbers, type ReportComparison } from './report-comparison'

type Person = { id: number; displayName: string }

function person(user: User | null | undefined): Person | null {
  return user ? { id: user.id, displayName: user.displayName } : null
}

/**
 * Engineers see released and retired entries; contributors also their own unreleased
 * ones; librarians and admins everything.
 */
export function visibleTo(viewer: User): WhereOptions<Entry> {
  const published: WhereOptions<Entry> = { status: { [Op.in]: ['released', 'retired'] } }
  if (hasRole(viewer.role, 'librarian')) return {}
  if (hasRole(viewer.role, 'contributor')) return { [Op.or]: [published, { ownerId: viewer.id }] }
  return published
}

function toEntrySummary(entry: Entry) {
  const family = families.find((f) => f.id === entry.familyId)
  const revision = entry.currentRevision
  return {
    id: entry.id,
    familyId: entry.familyId,
    // an entry may outlive its family's registration; it is still listed, by id
    familyName: family?.name ?? entry.familyId,
    kind: family?.kind ?? null,
    name: entry.name,
    summary: entry.summary,
    tags: entry.tags,
    status: entry.status,
    /** A change proposal names the released entry it would revise. */
    proposalForId: entry.proposalForId ?? null,
    owner: person(entry.owner),
    currentRevision: revision ? { id: revision.id, number: revision.number, metrics: revision.metrics } : null,
    updatedAt: entry.updatedAt.toISOString(),
  }
}

export type EntrySummary = ReturnType<typeof toEntrySummary>

function toRevisionView(revision: EntryRevision) {
  return {
    id: revision.id,
    number: revision.number,
    createdAt: revision.createdAt.toISOString(),
    createdBy: person(revision.createdBy),
    params: revision.params,
    ranges: revision.ranges,
    method: revision.method,
    curve: revision.curve,
    metrics: revision.metrics,
    warnings: revision.warnings,
  }
}

/** Points of a report's curve on entry pages and in the review queue. */
export const PREVIEW_POINTS = 400

/**
 * At most PREVIEW_POINTS points of a measured curve for drawing: the curve cut into buckets of
 * equal point count, each kept as its lowest and highest force in the order they came (min-max
 * decimation, so peaks and valleys stay on the plot); the first and last point always.
 */
function previewCurve(curve: { displacement: number[]; force: number[] }, max = PREVIEW_POINTS): { displacement: number[]; force: number[] } {
  const n = curve.displacement.length
  if (n <= max) return curve
  const keep = new Set<number>([0, n - 1])
  const buckets = Math.floor((max - 2) / 2)
  for (let b = 0; b < buckets; b++) {
    const from = 1 + Math.floor((b * (n - 2)) / buckets)
    const to = 1 + Math.floor(((b + 1) * (n - 2)) / buckets)
    let lo = from
    let hi = from
    for (let i = from; i < to; i++) {
      if (curve.force[i] < curve.force[lo]) lo = i
      if (curve.force[i] > curve.force[hi]) hi = i
    }
    keep.add(lo).add(hi)
  }
  const order = [...keep].sort((a, b) => a - b)
  return { displacement: order.map((i) => curve.displacement[i]), force: order.map((i) => curve.force[i]) }
}

/** The report's comparison as stored at upload; compared now only for a report from before it was stored. */
export function comparisonOf(familyId: string, report: TestReport, revision: EntryRevision | undefined | null, materials: MaterialNumbers) {
  if (report.comparison || report.comparisonProblem) return { comparison: report.comparison as ReportComparison | null, problem: report.comparisonProblem }
  return revision ? compareReport(familyId, report, revision, materials) : { comparison: null, problem: 'the revision this report tested is gone' }
}

export function toReportView(report: TestReport) {
  return {
    id: report.id,
    revisionId: report.revisionId,
    status: report.status,
    uploader: person(report.uploader),
    reviewer: person(report.reviewer),
    originalName: report.originalName,
    hasPhoto: report.photoPath !== null,
    printer: report.printer,
    material: report.material,
    lot: report.lot,
    orientation: report.orientation,
    testSpeed: report.testSpeed,
    notes: report.notes,
    reviewNote: report.reviewNote ?? '',
    reviewedAt: report.reviewedAt ? report.reviewedAt.toISOString() : null,
    // a preview for the overlay plot; the whole curve is GET /api/reports/:id/curve
    measuredCurve: previewCurve(report.measuredCurve),
    points: report.measuredCurve.displacement.length,
    createdAt: report.createdAt.toISOString(),
  }
}

function summaryIncludes(context: AppContext) {
  const { User, EntryRevision } = context.db.models
  return [
    { model: User, as: 'owner', attributes: ['id', 'displayName'] },
    { model: EntryRevision, as: 'currentRevision', attributes: ['id', 'number', 'metrics'] },
  ]
}

export async function listEntries(context: AppContext, viewer: User): Promise<EntrySummary[]> {
  const entries = await context.db.models.Entry.findAll({
    // a merged proposal lives on as a revision of its entry; it is read by id, not listed
    where: { [Op.and]: [visibleTo(viewer), { status: { [Op.ne]: 'merged' } }] },
    include: summaryIncludes(context),
    order: [['name', 'ASC'], ['id', 'ASC']],
  })
  return entries.map(toEntrySummary)
}

export function parseEntryId(raw: string): number {
  const id = Number(raw)
  if (!/^\d{1,15}$/.test(raw) || !Number.isSafeInteger(id)) throw notFound('entry')
  return id
}

/** Librarians see every report; others the accepted ones and their own. */
export function reportsVisibleTo(viewer: User): WhereOptions<TestReport> {
  if (hasRole(viewer.role, 'librarian')) return {}
  return { [Op.or]: [{ status: 'accepted' }, { uploaderId: viewer.id }] }
}

/**
 * The entry with its revisions (oldest first), the test reports the viewer may see (each
 * compared with its revision's prediction), review comments and open change proposals;
 * 404 when not visible.
 */
export async function showEntry(context: AppContext, viewer: User, id: number) {
  const { Entry, EntryComment, EntryRevision, TestReport, User } = context.db.models
  const entry = await Entry.findOne({ where: { [Op.and]: [{ id }, visibleTo(viewer)] }, include: summaryIncludes(context) })
  if (!entry) throw notFound('entry')
  const revisions = await EntryRevision.findAll({
    where: { entryId: entry.id },
    include: [{ model: User, as: 'createdBy', attributes: ['id', 'displayName'] }],
    order: [['number', 'ASC']],
  })
  const reports = await TestReport.findAll({
    where: { [Op.and]: [{ entryId: entry.id }, reportsVisibleTo(viewer)] },
    include: [
      { model: User, as: 'uploader', attributes: ['id', 'displayName'] },
      { model: User, as: 'reviewer', attributes: ['id', 'displayName'] },
    ],
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
  })
  const comments = await EntryComment.findAll({
    where: { entryId: entry.id },
    include: [{ model: User, as: 'author', attributes: ['id', 'displayName'] }],
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
  })
  const proposals = await Entry.findAll({
    where: { [Op.and]: [{ proposalForId: entry.id, status: { [Op.in]: ['draft', 'in_review'] } }, visibleTo(viewer)] },
    include: summaryIncludes(context),
    order: [['id', 'ASC']],
  })
  const proposalFor = entry.proposalForId ? await Entry.findByPk(entry.proposalForId, { attributes: ['id', 'name', 'status', 'currentRevisionId'] }) : null
  // only reports from before comparisons were stored need the materials
  const materials = reports.some((r) => !r.comparison && !r.comparisonProblem) ? await listMaterials(context) : []
  return {
    ...toEntrySummary(entry),
    defaultParams: entry.defaultParams,
    ranges: entry.ranges,
    materials: entry.materials,
    notes: entry.notes,
    revisions: revisions.map(toRevisionView),
    reports: reports.map((report) => {
      const { comparison, problem } = comparisonOf(entry.familyId, report, revisions.find((r) => r.id === report.revisionId), materials)
      return { ...toReportView(report), comparison, comparisonProblem: problem }
    }),
    comments: comments.map((c) => ({ id: c.id, kind: c.kind, text: c.text, author: person(c.author), createdAt: c.createdAt.toISOString() })),
    proposalFor: proposalFor ? { id: proposalFor.id, name: proposalFor.name, status: proposalFor.status, currentRevisionId: proposalFor.currentRevisionId } : null,
    proposals: proposals.map(toEntrySummary),
  }
}
