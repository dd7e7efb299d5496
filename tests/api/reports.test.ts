/**
 * Test-report uploads, review and calibration (docs/api.md, "Test reports"): good files in
 * each unit system, each kind of bad file refused whole with nothing stored, stored files
 * under generated names outside the web root, downloads, accept/reject, calibration
 * figures and adopting a fitted modulus.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { evaluate } from '../../catalog'
import type { Role } from '../../api/roles'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
const tokens = {} as Record<Role, string>
let entryId: number
let revisionId: number
let predicted: { displacement: number[]; force: number[] }

/** The measured stroke: the prediction at 85 % of the force (a printed part softer than the datasheet). */
const SCALE = 0.85
let stroke: { displacement: number[]; force: number[] }

// NIST SP 811 (2008), Appendix B.8: 1 in = 25.4 mm exactly, 1 gf = 9.80665 mN exactly,
// 1 lbf = 4.4482216152605 N (0.45359237 kg × 9.80665 m/s²)
const MM_PER_IN = 25.4
const N_PER_GF = 0.00980665
const N_PER_LBF = 4.4482216152605

const PNG = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(64, 1)])
const JPEG = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(64, 2)])

beforeAll(async () => {
  t = await startTestApp()
  for (const role of ['engineer', 'contributor', 'librarian', 'admin'] as Role[]) tokens[role] = await signInAs(t.app, role)
  const { Entry, EntryRevision } = t.context.db.models
  const entry = (await Entry.findOne({ where: { familyId: 'bistable-beam', status: 'released' }, order: [['id', 'ASC']] }))!
  const revision = (await EntryRevision.findByPk(entry.currentRevisionId!))!
  entryId = entry.id
  revisionId = revision.id
  predicted = revision.curve
  // 40 evenly spaced points over the first 80 % of the predicted travel, values to 6 digits
  const end = predicted.displacement[predicted.displacement.length - 1] * 0.8
  const displacement = Array.from({ length: 40 }, (_, i) => Number(((end * i) / 39).toPrecision(6)))
  const force = displacement.map((d) => {
    const at = predicted.displacement.findIndex((x) => x >= d)
    const i = Math.max(1, at)
    const x0 = predicted.displacement[i - 1], x1 = predicted.displacement[i]
    const f = predicted.force[i - 1] + ((d - x0) / (x1 - x0)) * (predicted.force[i] - predicted.force[i - 1])
    return Number((SCALE * f).toPrecision(6))
  })
  stroke = { displacement, force }
})
afterAll(() => t.close())

function csv(rows: Array<Array<string | number>>, delimiter = ','): Buffer {
  return Buffer.from(rows.map((r) => r.join(delimiter)).join('\n') + '\n')
}

function upload(role: Role, file: Buffer | null, fields: Record<string, string> = {}, name = 'stand-run.csv', photo?: [Buffer, string]) {
  let req = request(t.app).post(`/api/entries/${entryId}/reports`).set(bearer(tokens[role]))
  for (const [k, v] of Object.entries({ printer: 'Bench printer 2', material: 'PETG', lot: 'L-42', orientation: 'flat', testSpeed: '10', ...fields })) req = req.field(k, v)
  if (file) req = req.attach('file', file, name)
  if (photo) req = req.attach('photo', photo[0], photo[1])
  return req
}

function filesUnder(dir: string): string[] {
  let out: string[] = []
  let names: string[]
  try {
    names = readdirSync(dir)
  } catch {
    return []
  }
  for (const name of names) {
    const full = join(dir, name)
    out = statSync(full).isDirectory() ? [...out, ...filesUnder(full)] : [...out, full]
  }
  return out
}

async function stored() {
  return { reports: await t.context.db.models.TestReport.count(), files: filesUnder(t.context.config.uploadsDir).sort(), audit: await t.context.db.models.AuditEvent.count() }
}

function expectCurveClose(observed: { displacement: number[]; force: number[] }, expected: { displacement: number[]; force: number[] }) {
  expect(observed.displacement).toHaveLength(expected.displacement.length)
  observed.displacement.forEach((d, i) => expect(d).toBeCloseTo(expected.displacement[i], 6))
  observed.force.forEach((f, i) => expect(f).toBeCloseTo(expected.force[i], 6))
}

describe('POST /api/entries/:id/reports with good files', () => {
  const rowsOf = (dFactor: number, fFactor: number) => stroke.displacement.map((d, i) => [d / dFactor, stroke.force[i] / fFactor])

  it('reads mm and N with a header, comma separated', async () => {
    const res = await upload('contributor', csv([['displacement (mm)', 'force (N)'], ...rowsOf(1, 1)]))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expectCurveClose(res.body.report.measuredCurve, stroke)
    expect(res.body.report).toMatchObject({ status: 'submitted', revisionId, printer: 'Bench printer 2', material: 'PETG', lot: 'L-42', testSpeed: 10, hasPhoto: false, uploader: { displayName: 'Bram Kettleby' } })
  })

  it('reads in and lbf without a header, semicolon separated', async () => {
    const res = await upload('contributor', csv(rowsOf(MM_PER_IN, N_PER_LBF).map((r) => r.map((v) => v.toPrecision(12))), ';'), { displacementUnit: 'in', forceUnit: 'lbf' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expectCurveClose(res.body.report.measuredCurve, stroke)
  })

  it('reads mm and gf with a header, semicolons and decimal commas', async () => {
    const rows = rowsOf(1, N_PER_GF).map((r) => r.map((v) => v.toPrecision(12).replace('.', ',')))
    const res = await upload('contributor', csv([['Weg', 'Kraft'], ...rows], ';'), { forceUnit: 'gf', hasHeader: 'yes' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expectCurveClose(res.body.report.measuredCurve, stroke)
  })

  it('maps columns by header name among extra columns (time, displacement, force)', async () => {
    const rows = stroke.displacement.map((d, i) => [i * 0.1, stroke.force[i], d])
    const res = await upload('contributor', csv([['time', 'Load', 'Crosshead'], ...rows]), { displacementColumn: 'crosshead', forceColumn: '2' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expectCurveClose(res.body.report.measuredCurve, stroke)
  })

  it('compares the measurement with its revision\u2019s prediction and fits the modulus (85 % of 2000 MPa)', async () => {
    const res = await upload('contributor', csv(rowsOf(1, 1)))
    const comparison = res.body.report.comparison
    expect(comparison.revisionId).toBe(revisionId)
    expect(comparison.predictedMaterial).toMatchObject({ id: 'petg', modulus: 2000 })
    expect(comparison.modulusFit.modulus).toBeCloseTo(SCALE * 2000, 0)
    expect(comparison.modulusFit.pointsUsed).toBe(40)
    expect(comparison.peakForce.relative).toBeCloseTo(SCALE - 1, 2)
    expect(comparison.stiffness.relative).toBeCloseTo(SCALE - 1, 2)
  })

  it('stores a PNG photo, checked by its bytes, under a generated name', async () => {
    const res = await upload('contributor', csv(rowsOf(1, 1)), {}, 'run.csv', [PNG, 'bench.png'])
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.report.hasPhoto).toBe(true)
    const row = (await t.context.db.models.TestReport.findByPk(res.body.report.id))!
    expect(row.photoPath).toMatch(/^photos\/[0-9a-f]{32}\.png$/)
    const photo = await request(t.app).get(`/api/reports/${row.id}/photo`).set(bearer(tokens.contributor))
    expect(photo.status).toBe(200)
    expect(photo.headers['content-type']).toBe('image/png')
    expect(photo.headers['content-disposition']).toMatch(/^attachment; filename="flexshelf-report-\d+-photo\.png"$/)
    expect(photo.headers['x-content-type-options']).toBe('nosniff')
    expect(Buffer.compare(photo.body as Buffer, PNG)).toBe(0)
  })

  it('stores a JPEG photo sent under a misleading name and type as image/jpeg', async () => {
    const res = await upload('contributor', csv(rowsOf(1, 1)), {}, 'run.csv', [JPEG, 'bench.gif'])
    expect(res.status).toBe(201)
    const row = (await t.context.db.models.TestReport.findByPk(res.body.report.id))!
    expect(row.photoPath).toMatch(/\.jpg$/)
  })
})

describe('POST /api/entries/:id/reports with a file name that tries path traversal', () => {
  it('stores the file under a generated name inside uploads/, outside the web root, and keeps only the base name as a label', async () => {
    const before = await stored()
    const body = csv([['d', 'f'], ...stroke.displacement.map((d, i) => [d, stroke.force[i]])])
    const res = await upload('contributor', body, {}, '../../../../etc/evil\\..\\run.csv')
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.report.originalName).toBe('run.csv')
    expect(JSON.stringify(res.body)).not.toContain('filePath')
    const after = await stored()
    const added = after.files.filter((f) => !before.files.includes(f))
    expect(added).toHaveLength(1)
    const uploads = resolve(t.context.config.uploadsDir)
    expect(relative(uploads, added[0])).toMatch(/^reports\/[0-9a-f]{32}\.csv$/)
    expect(relative(resolve(t.context.config.webDir), added[0]).startsWith('..')).toBe(true)
    expect(readFileSync(added[0]).equals(body)).toBe(true)
    expect(filesUnder(t.dataDir).filter((f) => f.includes('evil'))).toEqual([])
  })

  it('serves the stored file back as an attachment with a safe type', async () => {
    const id = (await t.context.db.models.TestReport.findOne({ where: { originalName: 'run.csv' }, order: [['id', 'DESC']] }))!.id
    const res = await request(t.app).get(`/api/reports/${id}/file`).set(bearer(tokens.contributor)).buffer(true)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8')
    expect(res.headers['content-disposition']).toBe(`attachment; filename="flexshelf-report-${id}.csv"`)
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    expect(res.text.startsWith('d,f\n')).toBe(true)
  })
})

describe('POST /api/entries/:id/reports with a bad file', () => {
  const good = () => stroke.displacement.map((d, i) => [d, stroke.force[i]])
  const cases: Array<{ name: string; file: () => Buffer | null; fields?: Record<string, string>; filename?: string; photo?: [Buffer, string]; status: number; field: string; message: RegExp; row?: number | null; column?: number | null }> = [
    { name: 'no file', file: () => null, status: 400, field: 'file', message: /file is required/ },
    { name: 'a PNG renamed .csv', file: () => PNG, status: 400, field: 'file', message: /the file is a PNG image, not a CSV text file/ },
    { name: 'a workbook (.xlsx is a ZIP)', file: () => Buffer.concat([Buffer.from('PK\u0003\u0004'), Buffer.alloc(40, 7)]), filename: 'run.xlsx', status: 400, field: 'file', message: /ZIP archive/ },
    { name: 'binary bytes in a .csv', file: () => Buffer.from('0,0\n1,1\n\u0000\u0001\u0002,3\n'), status: 400, field: 'file', message: /binary data \(first at row 3\)/, row: 3 },
    { name: 'an empty file', file: () => Buffer.alloc(0), status: 400, field: 'file', message: /the file is empty/ },
    { name: 'a non-numeric force', file: () => csv([['d', 'f'], ...good().slice(0, 6), [1.9, 'n/a'], ...good().slice(7)]), status: 400, field: 'file', message: /^row 8, column 2 \(f\): "n\/a" is not a number$/, row: 8, column: 2 },
    { name: 'an empty cell', file: () => csv([['d', 'f'], ...good().slice(0, 3), [0.9, ''], ...good().slice(4)]), status: 400, field: 'file', message: /^row 5, column 2 \(f\) is empty$/, row: 5, column: 2 },
    { name: 'an empty force column', file: () => csv([['d', 'f'], ...good().map((r) => [r[0], ''])]), status: 400, field: 'file', message: /^column 2 \(f\) is empty: no values in any row$/, row: 2, column: 2 },
    { name: 'too few points', file: () => csv([['d', 'f'], ...good().slice(0, 4)]), status: 400, field: 'file', message: /has 4 data row\(s\); a measured curve needs at least 5/ },
    {
      name: 'displacement going back in a loading stroke',
      file: () => csv([['d', 'f'], ...good().slice(0, 10), [0.01, 0.2], ...good().slice(10)]),
      status: 400, field: 'file', message: /^row 12, column 1 \(d\): the displacement falls from [\d.]+ to 0\.01; a loading stroke must not go back/, row: 12, column: 1,
    },
    { name: 'a column named that is not in the header', file: () => csv([['d', 'f'], ...good()]), fields: { forceColumn: 'Load' }, status: 400, field: 'forceColumn', message: /no column is headed "Load" \(the header has "d", "f"\)/ },
    { name: 'a column number beyond the file', file: () => csv(good()), fields: { forceColumn: '3' }, status: 400, field: 'forceColumn', message: /the file has 2 column\(s\), so there is no column 3/ },
    { name: 'an unknown unit', file: () => csv(good()), fields: { forceUnit: 'kgf' }, status: 400, field: 'forceUnit', message: /forceUnit must be one of N, gf, lbf, N·mm/ },
    { name: 'a rotation unit on a displacement curve', file: () => csv(good()), fields: { displacementUnit: 'deg' }, status: 400, field: 'displacementUnit', message: /use mm or in/ },
    { name: 'no printer', file: () => csv(good()), fields: { printer: '' }, status: 400, field: 'printer', message: /printer must not be empty/ },
    { name: 'a revision of another entry', file: () => csv(good()), fields: { revisionId: '999999' }, status: 400, field: 'revisionId', message: /revision 999999 is not a revision of this entry/ },
    { name: 'a photo that is not an image', file: () => csv(good()), photo: [Buffer.from('<svg onload="alert(1)"/>'), 'x.png'], status: 400, field: 'photo', message: /photo must be a PNG or JPEG image/ },
    { name: 'a CSV over the 2 MB limit', file: () => Buffer.alloc(2 * 1024 * 1024 + 1, '1,2\n'), status: 413, field: 'file', message: /file is larger than the limit of 2 MB/ },
    { name: 'a photo over the 5 MB limit', file: () => csv(good()), photo: [Buffer.concat([PNG, Buffer.alloc(5 * 1024 * 1024)]), 'big.png'], status: 413, field: 'photo', message: /photo is larger than the limit of 5 MB/ },
  ]

  for (const c of cases) {
    describe(c.name, () => {
      it(`answers ${c.status} naming ${c.field}, and stores nothing (no row, no file, no audit event)`, async () => {
        const before = await stored()
        const res = await upload('contributor', c.file(), c.fields, c.filename, c.photo)
        expect(res.status, JSON.stringify(res.body)).toBe(c.status)
        const issues = res.body.error.details?.issues
        if (c.status === 400) expect(issues[0]).toMatchObject({ field: c.field, message: expect.stringMatching(c.message) })
        else expect(res.body.error).toMatchObject({ code: 'payload_too_large', message: expect.stringMatching(c.message), details: { field: c.field } })
        if (c.row !== undefined) expect(res.body.error.details.row).toBe(c.row)
        if (c.column !== undefined) expect(res.body.error.details.column).toBe(c.column)
        expect(await stored()).toEqual(before)
      })
    })
  }

  describe('as an engineer', () => {
    it('answers 403 and stores nothing', async () => {
      const before = await stored()
      expect((await upload('engineer', csv(good()))).status).toBe(403)
      expect(await stored()).toEqual(before)
    })
  })

  describe('for an entry that is not released', () => {
    it('answers 409 naming its status and stores nothing', async () => {
      const draft = await request(t.app).post('/api/entries').set(bearer(tokens.contributor)).send({ family: 'bistable-beam', name: 'Unreleased for reports' })
      const before = await stored()
      const res = await request(t.app).post(`/api/entries/${draft.body.entry.id}/reports`).set(bearer(tokens.contributor))
        .field('printer', 'P').field('material', 'PETG').attach('file', csv(good()), 'a.csv')
      expect(res.status).toBe(409)
      expect(res.body.error.message).toBe('this entry is draft; test reports are for released entries')
      expect(await stored()).toEqual(before)
    })
  })
})

describe('reviewing a report', () => {
  let reportId: number
  let outboxBefore: number

  beforeAll(async () => {
    outboxBefore = await t.context.db.models.OutboxMessage.count()
    const res = await upload('contributor', csv(stroke.displacement.map((d, i) => [d, stroke.force[i]])), { printer: 'Calibration printer', lot: 'L-7' })
    reportId = res.body.report.id
  })

  it('told the librarians when it was submitted', async () => {
    const sent = (await t.context.db.models.OutboxMessage.findAll({ order: [['id', 'ASC']] })).slice(outboxBefore)
    expect(sent.map((m) => m.to)).toEqual([[demoEmail('librarian')]])
    expect(sent[0].subject).toMatch(/a test report on ".+" waits for review/)
  })

  it('is hidden from engineers until accepted, visible to its uploader and librarians', async () => {
    const ids = async (role: Role) => (await request(t.app).get(`/api/entries/${entryId}`).set(bearer(tokens[role]))).body.entry.reports.map((r: { id: number }) => r.id)
    expect(await ids('engineer')).not.toContain(reportId)
    expect(await ids('contributor')).toContain(reportId)
    expect(await ids('librarian')).toContain(reportId)
    expect((await request(t.app).get(`/api/reports/${reportId}/file`).set(bearer(tokens.engineer))).status).toBe(404)
  })

  it('is in the review queue with its comparison', async () => {
    const res = await request(t.app).get('/api/review-queue').set(bearer(tokens.librarian))
    const item = res.body.reports.find((r: { id: number }) => r.id === reportId)
    expect(item.entry.id).toBe(entryId)
    expect(item.comparison.modulusFit.modulus).toBeCloseTo(SCALE * 2000, 0)
  })

  it('cannot be accepted by its contributor; a librarian accepts it and the uploader is told', async () => {
    const before = (await t.context.db.models.TestReport.findByPk(reportId))!.toJSON()
    expect((await request(t.app).post(`/api/reports/${reportId}/accept`).set(bearer(tokens.contributor)).send({})).status).toBe(403)
    expect((await t.context.db.models.TestReport.findByPk(reportId))!.toJSON()).toEqual(before)
    const outbox = await t.context.db.models.OutboxMessage.count()
    const res = await request(t.app).post(`/api/reports/${reportId}/accept`).set(bearer(tokens.librarian)).send({ note: 'Clean stroke.' })
    expect(res.status).toBe(200)
    expect(res.body.report).toMatchObject({ status: 'accepted', reviewNote: 'Clean stroke.', reviewer: { displayName: 'Lio Fennick' } })
    const sent = (await t.context.db.models.OutboxMessage.findAll({ order: [['id', 'ASC']] })).slice(outbox)
    expect(sent.map((m) => [m.to, m.subject])).toEqual([[[demoEmail('contributor')], expect.stringContaining('was accepted')]])
    const again = await request(t.app).post(`/api/reports/${reportId}/reject`).set(bearer(tokens.librarian)).send({})
    expect(again.status).toBe(409)
    expect(again.body.error.message).toBe('this report is accepted; only a submitted report can be rejected')
  })

  it('appears on the entry for engineers once accepted, and feeds the calibration figures', async () => {
    const entry = (await request(t.app).get(`/api/entries/${entryId}`).set(bearer(tokens.engineer))).body.entry
    expect(entry.reports.map((r: { id: number }) => r.id)).toEqual([reportId])
    const res = await request(t.app).get(`/api/entries/${entryId}/calibration`).set(bearer(tokens.engineer))
    expect(res.status).toBe(200)
    const group = res.body.calibration.groups.find((g: { printer: string }) => g.printer === 'Calibration printer')
    expect(group).toMatchObject({ material: 'PETG', count: 1, standardDeviation: null })
    expect(group.mean).toBeCloseTo(SCALE * 2000, 0)
  })

  it('adopts the fitted modulus as a calibrated material that the catalog then computes with', async () => {
    expect((await request(t.app).post(`/api/reports/${reportId}/adopt-modulus`).set(bearer(tokens.contributor)).send({})).status).toBe(403)
    const res = await request(t.app).post(`/api/reports/${reportId}/adopt-modulus`).set(bearer(tokens.librarian)).send({})
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const material = res.body.material
    expect(material).toMatchObject({ id: `petg-cal-r${reportId}`, name: 'PETG (FDM) — calibrated on Calibration printer', process: 'FDM', strainLimit: 0.02 })
    expect(material.modulus).toBeCloseTo(SCALE * 2000, 0)
    expect(material.source).toContain(`test report ${reportId}`)
    const listed = (await request(t.app).get('/api/materials').set(bearer(tokens.engineer))).body.materials.map((m: { id: string }) => m.id)
    expect(listed).toContain(material.id)
    // force scales with E: the calibrated material's peak is the fitted share of the nominal one
    const nominal = evaluate('bistable-beam', { modulus: 2000 }, { method: 'closed-form' }).metrics.peakForce as number
    const calibrated = await request(t.app).post('/api/families/bistable-beam/evaluate').set(bearer(tokens.engineer)).send({ params: { material: material.id }, method: 'closed-form' })
    expect(calibrated.body.metrics.peakForce / nominal).toBeCloseTo(material.modulus / 2000, 6)
    const twice = await request(t.app).post(`/api/reports/${reportId}/adopt-modulus`).set(bearer(tokens.librarian)).send({})
    expect(twice.status).toBe(409)
  })

  it('refuses to adopt from a report that is not accepted', async () => {
    const other = (await upload('contributor', csv(stroke.displacement.map((d, i) => [d, stroke.force[i]])))).body.report.id
    const res = await request(t.app).post(`/api/reports/${other}/adopt-modulus`).set(bearer(tokens.librarian)).send({})
    expect(res.status).toBe(409)
    expect(res.body.error.message).toBe("this report is submitted; only an accepted report's modulus can be adopted")
  })

  it('rejects a report with a note', async () => {
    const other = (await upload('contributor', csv(stroke.displacement.map((d, i) => [d, stroke.force[i]])))).body.report.id
    const res = await request(t.app).post(`/api/reports/${other}/reject`).set(bearer(tokens.librarian)).send({ note: 'Fixture slipped.' })
    expect(res.status).toBe(200)
    expect(res.body.report).toMatchObject({ status: 'rejected', reviewNote: 'Fixture slipped.' })
  })
})

describe('POST /api/entries/:id/reports on a hinge entry (rotation against moment)', () => {
  let hingeId: number
  beforeAll(async () => {
    const entry = (await t.context.db.models.Entry.findOne({ where: { familyId: 'notch-hinge', status: 'released' } }))!
    hingeId = entry.id
  })
  const rows = [['rotation (deg)', 'moment (N·mm)'], [0, 0], [1, 2.1], [2, 4.2], [3, 6.2], [4, 8.1], [5, 10]]

  it('reads degrees and N·mm by default', async () => {
    const res = await request(t.app).post(`/api/entries/${hingeId}/reports`).set(bearer(tokens.contributor))
      .field('printer', 'P').field('material', 'PETG').attach('file', csv(rows), 'hinge.csv')
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.report.measuredCurve).toEqual({ displacement: [0, 1, 2, 3, 4, 5], force: [0, 2.1, 4.2, 6.2, 8.1, 10] })
  })

  it('refuses length and force units, naming both fields', async () => {
    const res = await request(t.app).post(`/api/entries/${hingeId}/reports`).set(bearer(tokens.contributor))
      .field('printer', 'P').field('material', 'PETG').field('displacementUnit', 'mm').field('forceUnit', 'N').attach('file', csv(rows), 'hinge.csv')
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toEqual(['displacementUnit', 'forceUnit'])
  })
})
