/** Shelf entries as each role may see them (docs/api.md, "GET /api/entries"). */
import { Op, type WhereOptions } from 'sequelize'
import { families } from '../../catalog'
import type { AppContext } from '../context'
import type { Entry, EntryRevision, TestReport, User } from '../db'
import { notFound } from '../errors'
import { hasRole } from '../roles'

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
    owner: person(entry.owner),
    currentRevision: revision ? { id: revision.id, number: revision.number, metrics: revision.metrics } : null,
    updatedAt: entry.updatedAt.toISOString(),
  }
}

export type EntrySummary = ReturnType<typeof toEntrySummary>

export function toRevisionView(revision: EntryRevision) {
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
    measuredCurve: report.measuredCurve,
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
    where: visibleTo(viewer),
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

/** The entry with its revisions (oldest first) and test reports; 404 when not visible. */
export async function showEntry(context: AppContext, viewer: User, id: number) {
  const { Entry, EntryRevision, TestReport, User } = context.db.models
  const entry = await Entry.findOne({ where: { [Op.and]: [{ id }, visibleTo(viewer)] }, include: summaryIncludes(context) })
  if (!entry) throw notFound('entry')
  const revisions = await EntryRevision.findAll({
    where: { entryId: entry.id },
    include: [{ model: User, as: 'createdBy', attributes: ['id', 'displayName'] }],
    order: [['number', 'ASC']],
  })
  const reports = await TestReport.findAll({
    where: { entryId: entry.id },
    include: [
      { model: User, as: 'uploader', attributes: ['id', 'displayName'] },
      { model: User, as: 'reviewer', attributes: ['id', 'displayName'] },
    ],
    order: [['createdAt', 'ASC'], ['id', 'ASC']],
  })
  return {
    ...toEntrySummary(entry),
    defaultParams: entry.defaultParams,
    ranges: entry.ranges,
    materials: entry.materials,
    notes: entry.notes,
    revisions: revisions.map(toRevisionView),
    reports: reports.map(toReportView),
  }
}
