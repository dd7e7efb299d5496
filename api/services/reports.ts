/**
 * Test reports: upload (CSV plus an optional photo), review, downloads, calibration figures
 * and adopting a fitted modulus as a calibrated material (docs/api.md, "Test reports").
 *
 * Nothing of a refused upload is kept: files arrive in memory (multer memory storage) and
 * are stored (file-store.ts: the uploads folder or the bucket) only once every check has
 * passed, just before the write transaction that creates the report; if that transaction
 * fails, the files stored are removed.
 */
import { randomBytes } from 'node:crypto'
import { Op } from 'sequelize'
import { z } from 'zod'
import { calibrationSummary, families } from '../../catalog'
import type { AppContext } from '../context'
import type { Entry, EntryRevision, TestReport, User } from '../db'
import { conflict, HttpError, notFound, validationFailed } from '../errors'
import { bodySchema, optionalTextField, parseBody, textField, type TextRules } from '../validation'
import { recordAudit } from './audit'
import { comparisonOf, reportsVisibleTo, showEntry, toReportView, visibleTo } from './entries'
import { listMaterials } from './materials'
import { librarianAddresses, notify, type Notice } from './notifications'
import { compute } from './compute-pool'
import { predictedMaterialOf, type ComparedRevision, type MaterialNumbers } from './report-comparison'
import { CsvError, parseMeasuredCurve } from './report-csv'
import { DISPLACEMENT_UNITS, FORCE_UNITS, fileUnitChoices } from '../../catalog/units'
import { neutraliseCsvFormulae } from './csv-safety'
import { fileStore } from './file-store'

export interface UploadedFile {
  originalname: string
  size: number
  buffer: Buffer
}

const optionalText = (field: string, max: number, rules: TextRules = {}) => optionalTextField(field, max, rules).optional()

const requiredText = (field: string, max: number) => textField(field, max)

const reportFields = bodySchema({
  revisionId: z.string({ error: 'revisionId must be a revision id' }).regex(/^\d{1,15}$/, 'revisionId must be a revision id (a whole number)').optional(),
  printer: requiredText('printer', 120),
  material: requiredText('material', 120),
  lot: optionalText('lot', 120),
  orientation: optionalText('orientation', 120),
  testSpeed: z.string({ error: 'testSpeed must be a number of mm/min' }).trim()
    .refine((v) => v === '' || (/^\d*\.?\d+([eE][+-]?\d+)?$/.test(v) && Number(v) > 0 && Number(v) <= 10000), 'testSpeed must be a positive number of mm/min, at most 10000')
    .optional(),
  notes: optionalText('notes', 5000, { multiline: true }),
  displacementColumn: optionalText('displacementColumn', 120),
  forceColumn: optionalText('forceColumn', 120),
  displacementUnit: z.enum(DISPLACEMENT_UNITS, { error: `displacementUnit must be one of ${DISPLACEMENT_UNITS.join(', ')}` }).optional(),
  forceUnit: z.enum(FORCE_UNITS, { error: `forceUnit must be one of ${FORCE_UNITS.join(', ')}` }).optional(),
  hasHeader: z.enum(['auto', 'yes', 'no'], { error: 'hasHeader must be auto, yes or no' }).optional(),
})

const PNG = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]
const JPEG = [0xff, 0xd8, 0xff]

/** The photo's type from its first bytes; the name and the browser's claim are not trusted. */
function photoTypeOf(buffer: Buffer): 'png' | 'jpeg' | null {
  if (PNG.every((b, i) => buffer[i] === b)) return 'png'
  if (JPEG.every((b, i) => buffer[i] === b)) return 'jpeg'
  return null
}

const tooLarge = (field: string, limit: number) =>
  new HttpError(413, 'payload_too_large', `${field} is larger than the limit of ${Math.round(limit / 1024 / 1024 * 10) / 10} MB`, { field, limit })

/** Units the entry's curve is drawn in decide which units a file may use. */
function checkUnits(entry: Entry, displacementUnit: string | undefined, forceUnit: string | undefined) {
  const family = families.find((f) => f.id === entry.familyId)
  const rotational = family?.axes.displacement.unit === 'deg'
  const allowed = fileUnitChoices(family?.axes.displacement.unit)
  const d = displacementUnit ?? allowed.displacement[0]
  const f = forceUnit ?? allowed.force[0]
  const issues = []
  if (!(allowed.displacement as readonly string[]).includes(d)) {
    issues.push({ field: 'displacementUnit', message: rotational ? `displacementUnit: this entry's curve is rotation in deg; use deg` : `displacementUnit: this entry's curve is displacement; use mm or in` })
  }
  if (!(allowed.force as readonly string[]).includes(f)) {
    issues.push({ field: 'forceUnit', message: rotational ? `forceUnit: this entry's curve is moment in N·mm; use N·mm` : `forceUnit: this entry's curve is force; use N, gf or lbf` })
  }
  if (issues.length) throw validationFailed(issues)
  return { displacementUnit: d as 'mm', forceUnit: f as 'N' }
}

const generatedName = (extension: string) => `${randomBytes(16).toString('hex')}.${extension}`

async function loadVisibleEntry(context: AppContext, viewer: User, entryId: number): Promise<Entry> {
  const entry = await context.db.models.Entry.findOne({ where: { [Op.and]: [{ id: entryId }, visibleTo(viewer)] } })
  if (!entry) throw notFound('entry')
  return entry
}

/** POST /api/entries/:id/reports */
export async function createReport(context: AppContext, actor: User, entryId: number, body: unknown, files: { file?: UploadedFile; photo?: UploadedFile }) {
  const entry = await loadVisibleEntry(context, actor, entryId)
  const fields = parseBody(reportFields, body)
  if (entry.status !== 'released') throw conflict(`this entry is ${entry.status.replace('_', ' ')}; test reports are for released entries`, { status: entry.status })
  const { EntryRevision, TestReport } = context.db.models
  const revisionId = fields.revisionId ? Number(fields.revisionId) : entry.currentRevisionId
  const revision = revisionId ? await EntryRevision.findOne({ where: { id: revisionId, entryId: entry.id } }) : null
  if (!revision) throw validationFailed([{ field: 'revisionId', message: fields.revisionId ? `revisionId: revision ${fields.revisionId} is not a revision of this entry` : 'revisionId: this entry has no revision yet' }])
  const units = checkUnits(entry, fields.displacementUnit, fields.forceUnit)

  const { file, photo } = files
  if (!file) throw validationFailed([{ field: 'file', message: 'file is required: the CSV of displacement and force from the test stand' }])
  const limits = context.config.uploadLimits
  if (file.size > limits.csvBytes) throw tooLarge('file', limits.csvBytes)
  if (photo && photo.size > limits.photoBytes) throw tooLarge('photo', limits.photoBytes)
  const photoType = photo ? photoTypeOf(photo.buffer) : null
  if (photo && !photoType) throw validationFailed([{ field: 'photo', message: 'photo must be a PNG or JPEG image (its content is neither)' }])

  let parsed
  try {
    parsed = parseMeasuredCurve(file.buffer, { displacementColumn: fields.displacementColumn, forceColumn: fields.forceColumn, hasHeader: fields.hasHeader ?? 'auto', ...units })
  } catch (err) {
    if (!(err instanceof CsvError)) throw err
    const { field, message, row, column } = err.problem
    throw new HttpError(400, 'validation_failed', message, { issues: [{ field, message }], row, column })
  }

  // compared with the prediction once, here; entry pages and the review queue read it back
  const { comparison, problem: comparisonProblem } = await compute.reportFit({ familyId: entry.familyId, measuredCurve: parsed.curve, revision: plainRevision(revision), materials: await listMaterials(context) })

  const filePath = `reports/${generatedName('csv')}`
  const photoPath = photo ? `photos/${generatedName(photoType === 'png' ? 'png' : 'jpg')}` : null
  // the files go first, under new random keys, and the row that points at them second: a write
  // transaction may run more than once (PostgreSQL retries a conflict), a file write must not
  const store = fileStore(context.config)
  const written: string[] = []
  let report: TestReport
  try {
    for (const [key, buffer, type] of [[filePath, file.buffer, 'text/csv'], ...(photo && photoPath ? [[photoPath, photo.buffer, photoType === 'png' ? 'image/png' : 'image/jpeg']] : [])] as Array<[string, Buffer, string]>) {
      await store.put(key, buffer, type)
      written.push(key)
    }
    report = await context.db.write(async (transaction) => {
      const created = await TestReport.create({
        entryId: entry.id, revisionId: revision.id, uploaderId: actor.id, reviewerId: null,
        filePath, originalName: cleanName(file.originalname), photoPath,
        printer: fields.printer, material: fields.material, lot: fields.lot ?? '', orientation: fields.orientation ?? '',
        testSpeed: fields.testSpeed ? Number(fields.testSpeed) : null, notes: fields.notes ?? '', status: 'submitted',
        measuredCurve: parsed.curve,
        comparison: comparison as unknown as Record<string, unknown> | null, comparisonProblem,
      }, { transaction })
      await recordAudit(context, transaction, {
        actorId: actor.id, action: 'report.submitted', subjectType: 'report', subjectId: created.id,
        details: { from: null, to: 'submitted', entryId: entry.id, revisionId: revision.id, points: parsed.curve.displacement.length },
      })
      return created
    })
  } catch (err) {
    await Promise.all(written.map((key) => store.remove(key)))
    throw err
  }
  await notify(context, [{
    to: await librarianAddresses(context),
    subject: `Flexshelf: a test report on "${entry.name}" waits for review`,
    text: `${actor.displayName} uploaded test report ${report.id} for "${entry.name}" (entry ${entry.id}, revision ${revision.number}): ${parsed.curve.displacement.length} points, printer ${fields.printer}, material ${fields.material}.`,
  }])
  return reportView(context, actor, report.id)
}

/** The client's file name is kept only as a label: no folders, no control characters. */
function cleanName(name: string): string {
  const base = (name ?? '').split(/[\\/]/).pop() ?? ''
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, '').replace(/^\.+/, '').trim().slice(0, 200)
  return clean || 'report.csv'
}

/** One report as the entry page shows it (with its comparison), for a viewer who may see it. */
/** What one report's view is read from: the report with its people, entry and revision. */
function reportIncludes(context: AppContext) {
  const { Entry, EntryRevision, User } = context.db.models
  return [
    { model: User, as: 'uploader', attributes: ['id', 'displayName'] },
    { model: User, as: 'reviewer', attributes: ['id', 'displayName'] },
    { model: Entry, as: 'entry', attributes: ['id', 'name', 'familyId'] },
    { model: EntryRevision, as: 'revision' },
  ]
}

type LoadedReport = TestReport & { entry?: Entry; revision?: EntryRevision | null }

function viewOfLoaded(report: LoadedReport, materials: MaterialNumbers) {
  const entry = report.entry!
  const { comparison, problem } = comparisonOf(entry.familyId, report, report.revision, materials)
  return { ...toReportView(report), comparison, comparisonProblem: problem, entry: { id: entry.id, name: entry.name, familyId: entry.familyId } }
}

/** One report as its entry page shows it (its own row only: no other report is read or compared). */
async function reportView(context: AppContext, viewer: User, reportId: number) {
  await loadVisibleReport(context, viewer, reportId)
  const report = (await context.db.models.TestReport.findByPk(reportId, { include: reportIncludes(context) })) as LoadedReport | null
  if (!report?.entry) throw notFound('test report')
  const materials = report.comparison || report.comparisonProblem ? [] : await listMaterials(context)
  return viewOfLoaded(report, materials)
}

/** GET /api/reports/:id/curve: the whole measured curve (entry pages carry a preview of it). */
export async function reportCurve(context: AppContext, viewer: User, reportId: number) {
  const report = await loadVisibleReport(context, viewer, reportId)
  return { reportId: report.id, points: report.measuredCurve.displacement.length, measuredCurve: report.measuredCurve }
}

async function loadVisibleReport(context: AppContext, viewer: User, reportId: number): Promise<TestReport> {
  const { Entry, TestReport } = context.db.models
  const report = await TestReport.findOne({ where: { [Op.and]: [{ id: reportId }, reportsVisibleTo(viewer)] } })
  if (!report) throw notFound('test report')
  const entry = await Entry.findOne({ where: { [Op.and]: [{ id: report.entryId }, visibleTo(viewer)] }, attributes: ['id'] })
  if (!entry) throw notFound('test report')
  return report
}

export function parseReportId(raw: string): number {
  const id = Number(raw)
  if (!/^\d{1,15}$/.test(raw) || !Number.isSafeInteger(id)) throw notFound('test report')
  return id
}

const reviewBody = bodySchema({ note: optionalTextField('note', 5000, { multiline: true }).optional() })

/** POST /api/reports/:id/accept and /reject */
export async function reviewReport(context: AppContext, actor: User, reportId: number, decision: 'accepted' | 'rejected', body: unknown) {
  const { note } = parseBody(reviewBody, body)
  const { Entry, TestReport, User } = context.db.models
  const notices: Notice[] = []
  await context.db.write(async (transaction) => {
    const report = await TestReport.findByPk(reportId, { transaction })
    if (!report) throw notFound('test report')
    if (report.status !== 'submitted') {
      throw conflict(`this report is ${report.status}; only a submitted report can be ${decision}`, { status: report.status })
    }
    await report.update({ status: decision, reviewerId: actor.id, reviewNote: note ?? '', reviewedAt: new Date() }, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: decision === 'accepted' ? 'report.accepted' : 'report.rejected', subjectType: 'report', subjectId: report.id,
      details: { from: 'submitted', to: decision, entryId: report.entryId, note: note ?? '' },
    })
    const uploader = await User.findByPk(report.uploaderId, { transaction })
    const entry = await Entry.findByPk(report.entryId, { transaction, attributes: ['id', 'name'] })
    if (uploader && uploader.id !== actor.id) {
      notices.push({
        to: [uploader.email],
        subject: `Flexshelf: your test report on "${entry?.name}" was ${decision}`,
        text: `Hello ${uploader.displayName},\n\n${actor.displayName} ${decision} your test report ${report.id} on "${entry?.name}".${note ? `\n\nNote:\n${note}` : ''}`,
      })
    }
  })
  await notify(context, notices)
  return reportView(context, actor, reportId)
}

/** GET /api/reports/:id/file and /photo: the stored bytes with a fixed, safe type. */
export async function reportDownload(context: AppContext, viewer: User, reportId: number, which: 'file' | 'photo') {
  const report = await loadVisibleReport(context, viewer, reportId)
  const path = which === 'file' ? report.filePath : report.photoPath
  if (!path) throw notFound('photo of this test report')
  const store = fileStore(context.config)
  const missing = () => notFound(which === 'file' ? 'stored file of this test report' : 'stored photo of this test report')
  if (which === 'file') {
    const body = await store.read(path)
    if (!body) throw missing()
    // the upload's own text, but no cell a spreadsheet would run as a formula (csv-safety.ts)
    return { body: Buffer.from(neutraliseCsvFormulae(body.toString('utf8'))), contentType: 'text/csv; charset=utf-8', filename: `flexshelf-report-${report.id}.csv` }
  }
  // a photo is sent on as it arrives from the store (up to 5 MB, no need to hold it whole)
  const body = await store.stream(path)
  if (!body) throw missing()
  const png = path.endsWith('.png')
  return { body, contentType: png ? 'image/png' : 'image/jpeg', filename: `flexshelf-report-${report.id}-photo.${png ? 'png' : 'jpg'}` }
}

/** GET /api/entries/:id/calibration: fitted moduli of the accepted reports, per printer and material. */
export async function entryCalibration(context: AppContext, viewer: User, entryId: number) {
  const detail = await showEntry(context, viewer, entryId)
  const accepted = detail.reports.filter((r) => r.status === 'accepted')
  const fitted = accepted.filter((r) => r.comparison?.modulusFit)
  const samples = fitted.map((r) => ({ reportId: r.id, printer: r.printer, material: r.material, modulus: r.comparison!.modulusFit!.modulus }))
  return {
    entryId: detail.id,
    groups: calibrationSummary(samples),
    reports: fitted.map((r) => ({
      reportId: r.id, revisionId: r.revisionId, printer: r.printer, material: r.material, lot: r.lot,
      modulus: r.comparison!.modulusFit!.modulus, predictedModulus: r.comparison!.modulusFit!.predictedModulus,
      predictedMaterial: r.comparison!.predictedMaterial,
    })),
    unfitted: accepted.filter((r) => !r.comparison?.modulusFit).map((r) => ({ reportId: r.id, reason: r.comparison?.modulusFitProblem ?? r.comparisonProblem ?? 'no fit' })),
  }
}

const adoptBody = bodySchema({
  name: textField('name', 120).optional(),
})

/** The revision as plain data for a report fit (which may run on a queue worker). */
const plainRevision = (r: EntryRevision): ComparedRevision => ({ id: r.id, number: r.number, params: r.params, curve: r.curve })

const sig = (v: number) => Number(v.toPrecision(4))

/** POST /api/reports/:id/adopt-modulus: a calibrated material with the report's fitted modulus. */
export async function adoptModulus(context: AppContext, actor: User, reportId: number, body: unknown) {
  const { name } = parseBody(adoptBody, body)
  const { Entry, EntryRevision, Material, TestReport } = context.db.models
  const report = await TestReport.findByPk(reportId)
  if (!report) throw notFound('test report')
  if (report.status !== 'accepted') throw conflict(`this report is ${report.status}; only an accepted report's modulus can be adopted`, { status: report.status })
  const entry = (await Entry.findByPk(report.entryId))!
  const revision = report.revisionId ? await EntryRevision.findByPk(report.revisionId) : null
  if (!revision) throw conflict('the revision this report tested is gone, so there is no prediction to calibrate against')
  const materials = await listMaterials(context)
  const { comparison, problem } = await compute.reportFit({ familyId: entry.familyId, measuredCurve: report.measuredCurve, revision: plainRevision(revision), materials })
  if (!comparison?.modulusFit) throw conflict(`no effective modulus could be fitted to this report: ${comparison?.modulusFitProblem ?? problem}`)
  const base = predictedMaterialOf(entry.familyId, revision, materials)
  const baseMaterial = base?.id ? materials.find((m) => m.id === base.id) : undefined
  if (!baseMaterial) throw conflict('the prediction used a custom modulus rather than a shelf material, so there is no material to calibrate')

  const fit = comparison.modulusFit
  const printer = report.printer || 'an unnamed printer'
  const material = await context.db.write(async (transaction) => {
    const created = await Material.create({
      id: `${baseMaterial.id}-cal-r${report.id}`,
      name: name ?? `${baseMaterial.name} — calibrated on ${printer}`,
      process: baseMaterial.process,
      modulus: sig(fit.modulus),
      strainLimit: baseMaterial.strainLimit,
      poissonRatio: baseMaterial.poissonRatio,
      poissonRatioSource: `From ${baseMaterial.name}: ${baseMaterial.poissonRatioSource}`,
      density: baseMaterial.density,
      notes: `Calibrated for ${printer}; confirm on printed parts before relying on it, and recalibrate for a new printer, material lot or orientation.`,
      source: `Effective modulus fitted to test report ${report.id} on "${entry.name}" (revision ${revision.number}; printer ${printer}, material ${report.material}${report.lot ? `, lot ${report.lot}` : ''}): `
        + `least squares on the predicted curve's scaling, ${fit.pointsUsed} points, ${sig(fit.scale)} × ${baseMaterial.modulus} MPa of ${baseMaterial.name}. Strain limit and density from ${baseMaterial.name}.`,
    }, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: 'material.calibrated', subjectType: 'material', subjectId: created.id,
      details: { reportId: report.id, entryId: entry.id, modulus: created.modulus, baseMaterialId: baseMaterial.id },
    })
    return created
  })
  return { id: material.id, name: material.name, process: material.process, modulus: material.modulus, poissonRatio: material.poissonRatio, poissonRatioSource: material.poissonRatioSource, strainLimit: material.strainLimit, density: material.density, notes: material.notes, source: material.source }
}

/** The reports waiting for review, each with its comparison. */
/** A page of the queue: `limit` items from `offset`. */
export interface QueuePage {
  limit: number
  offset: number
}

/**
 * Submitted reports, oldest first, one page of them: one query, each report's stored
 * comparison, so the work grows with the page and not with the square of an entry's reports.
 */
export async function reviewQueueReports(context: AppContext, _viewer: User, page: QueuePage = { limit: 50, offset: 0 }) {
  const { TestReport } = context.db.models
  const where = { status: 'submitted' as const }
  const [total, waiting] = await Promise.all([
    TestReport.count({ where }),
    TestReport.findAll({ where, include: reportIncludes(context), order: [['createdAt', 'ASC'], ['id', 'ASC']], limit: page.limit, offset: page.offset }),
  ])
  const loaded = waiting as LoadedReport[]
  const materials = loaded.some((r) => !r.comparison && !r.comparisonProblem) ? await listMaterials(context) : []
  return { total, items: loaded.filter((r) => r.entry).map((r) => viewOfLoaded(r, materials)) }
}

