/**
 * Issue 11, finding 6: large test reports. A row limit with a 400 that states it; the
 * comparison with the prediction (features and modulus fit) made once at upload and read
 * back, not refitted on every read; the review queue one query per page, paginated; entry
 * pages carry a preview of each curve and the whole curve loads on demand.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_REPORT_ROWS } from '../../api/services/report-csv'
import { PREVIEW_POINTS } from '../../api/services/entries'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let contributor: string
let librarian: string
let entryId: number
let predictedPeak: number

beforeAll(async () => {
  t = await startTestApp()
  contributor = await signInAs(t.app, 'contributor')
  librarian = await signInAs(t.app, 'librarian')
  const entry = (await t.context.db.models.Entry.findOne({ where: { familyId: 'snap-hook', status: 'released' }, order: [['id', 'ASC']] }))!
  entryId = entry.id
  const revision = (await t.context.db.models.EntryRevision.findByPk(entry.currentRevisionId!))!
  predictedPeak = Math.max(...revision.curve.force)
})
afterAll(() => t.close())

/** A smooth loading stroke of n rows rising to a peak at 60 % of the travel, then falling. */
function stroke(n: number): Buffer {
  const rows = ['displacement,force']
  for (let i = 0; i < n; i++) {
    const x = (3 * i) / (n - 1)
    rows.push(`${x.toFixed(6)},${(predictedPeak * Math.sin((Math.PI * x) / 3.6)).toFixed(6)}`)
  }
  return Buffer.from(rows.join('\n') + '\n')
}

const upload = (file: Buffer) => request(t.app).post(`/api/entries/${entryId}/reports`).set(bearer(contributor))
  .field('printer', 'Bench printer 9').field('material', 'PETG').attach('file', file, 'long-run.csv')

describe('the row limit', () => {
  it('refuses a 110,000-row file with 400 naming the file and stating the limit, storing nothing', async () => {
    const before = await t.context.db.models.TestReport.count()
    const res = await upload(stroke(110_000))
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues[0].field).toBe('file')
    expect(res.body.error.message).toBe(`the file has 110001 rows; a test report may hold at most ${MAX_REPORT_ROWS} data rows (plus a header): resample the stroke or export fewer points`)
    expect(await t.context.db.models.TestReport.count()).toBe(before)
  })

  it('accepts exactly the limit', async () => {
    expect((await upload(stroke(MAX_REPORT_ROWS))).status).toBe(201)
  })
})

describe('a large report on the entry page', () => {
  let reportId: number
  beforeAll(async () => {
    const res = await upload(stroke(5000))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    reportId = res.body.report.id
  })

  it('carries a preview of at most 400 points that keeps the peak, and the whole curve on demand', async () => {
    const entry = await request(t.app).get(`/api/entries/${entryId}`).set(bearer(librarian))
    const report = entry.body.entry.reports.find((r: { id: number }) => r.id === reportId)
    expect(report.points).toBe(5000)
    expect(report.measuredCurve.displacement.length).toBeLessThanOrEqual(PREVIEW_POINTS)
    const whole = await request(t.app).get(`/api/reports/${reportId}/curve`).set(bearer(librarian))
    expect(whole.status).toBe(200)
    expect(whole.body.points).toBe(5000)
    expect(whole.body.measuredCurve.displacement.length).toBe(5000)
    // min-max decimation: the preview's highest force is the curve's own
    expect(Math.max(...report.measuredCurve.force)).toBe(Math.max(...whole.body.measuredCurve.force))
    expect(report.measuredCurve.displacement[0]).toBe(whole.body.measuredCurve.displacement[0])
    expect(report.measuredCurve.displacement.at(-1)).toBe(whole.body.measuredCurve.displacement.at(-1))
  })

  it('reads the comparison stored at upload instead of refitting it', async () => {
    const row = (await t.context.db.models.TestReport.findByPk(reportId))!
    const stored = row.comparison as { modulusFit: { modulus: number } | null; peakForce: unknown }
    expect(stored.peakForce).not.toBeNull()
    expect(stored.modulusFit).not.toBeNull()
    // a marker no fit could give: if the entry page refitted, it would not show it
    await row.update({ comparison: { ...stored, modulusFit: { ...stored.modulusFit!, modulus: 123.456 } } })
    const entry = await request(t.app).get(`/api/entries/${entryId}`).set(bearer(librarian))
    expect(entry.body.entry.reports.find((r: { id: number }) => r.id === reportId).comparison.modulusFit.modulus).toBe(123.456)
    const queue = await request(t.app).get('/api/review-queue').set(bearer(librarian))
    expect(queue.body.reports.find((r: { id: number }) => r.id === reportId).comparison.modulusFit.modulus).toBe(123.456)
  })
})

describe('GET /api/review-queue pages', () => {
  it('answers a page of reports with the totals, oldest first', async () => {
    const all = await request(t.app).get('/api/review-queue').set(bearer(librarian))
    const total = all.body.page.totalReports
    expect(total).toBeGreaterThanOrEqual(2)
    expect(all.body.page).toMatchObject({ limit: 50, offset: 0 })
    const first = await request(t.app).get('/api/review-queue?limit=1').set(bearer(librarian))
    const second = await request(t.app).get('/api/review-queue?limit=1&offset=1').set(bearer(librarian))
    expect(first.body.reports.map((r: { id: number }) => r.id)).toEqual([all.body.reports[0].id])
    expect(second.body.reports.map((r: { id: number }) => r.id)).toEqual([all.body.reports[1].id])
    expect(second.body.page).toEqual({ limit: 1, offset: 1, totalEntries: all.body.page.totalEntries, totalReports: total })
  })

  it('refuses a limit outside 1–100 by field', async () => {
    const res = await request(t.app).get('/api/review-queue?limit=100000&offset=-1').set(bearer(librarian))
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toEqual(['limit', 'offset'])
  })
})
