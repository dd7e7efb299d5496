/**
 * GET /api/compare (and /csv, /pdf): up to four results or saved configurations side by side.
 * The best of each row is judged here from the values themselves.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import Papa from 'papaparse'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'
import { readPdf } from './pdf-text'

let t: TestApp
let engineer: string
let colleague: string
const ids = { switch: 0, hinge: 0, saved: 0 }
const q = (items: unknown) => `items=${encodeURIComponent(JSON.stringify(items))}`

beforeAll(async () => {
  t = await startTestApp()
  const { Entry } = t.context.db.models
  ids.switch = (await Entry.findOne({ where: { name: 'Power switch, field node shell S1' } }))!.id
  ids.hinge = (await Entry.findOne({ where: { name: 'Battery door hinge, field node shell S1' } }))!.id
  engineer = await signInAs(t.app, 'engineer')
  colleague = await signInAs(t.app, 'contributor')
  ids.saved = (await request(t.app).post('/api/configurations').set(bearer(engineer)).send({ entryId: ids.switch, name: 'Thin switch', params: { thickness: 0.6 } })).body.configuration.id
})
afterAll(() => t.close())

const items = () => [{ entryId: ids.switch, params: { thickness: 0.8 } }, { configurationId: ids.saved }, { entryId: ids.hinge }]

describe('GET /api/compare', () => {
  it('checks each candidate and marks the best of each row that has a direction', async () => {
    const res = await request(t.app).get(`/api/compare?${q(items())}`).set(bearer(engineer))
    expect(res.status).toBe(200)
    const { candidates, metrics, printability } = res.body.comparison
    expect(candidates.map((c: { label: string }) => c.label)).toEqual(['Power switch, field node shell S1', 'Thin switch (saved)', 'Battery door hinge, field node shell S1'])
    expect(candidates[1].check.evaluation.params.thickness).toBe(0.6)
    for (const row of metrics as Array<{ values: Array<number | null>; better: string | null; best: number | null }>) {
      const numbers = row.values.filter((v): v is number => typeof v === 'number')
      if (row.best === null) continue
      const want = row.better === 'higher' ? Math.max(...numbers) : Math.min(...numbers)
      expect(row.values[row.best]).toBe(want)
    }
    expect(metrics.some((r: { best: number | null }) => r.best !== null)).toBe(true)
    expect(printability.length).toBeGreaterThan(0)
    expect(printability[0].levels).toHaveLength(3)
  })

  it('refuses more than four, none, and someone else\u2019s saved configuration', async () => {
    const five = Array.from({ length: 5 }, () => ({ entryId: ids.hinge }))
    const tooMany = await request(t.app).get(`/api/compare?${q(five)}`).set(bearer(engineer))
    expect(tooMany.status).toBe(400)
    expect(JSON.stringify(tooMany.body)).toMatch(/at most 4/)
    expect((await request(t.app).get(`/api/compare?${q([])}`).set(bearer(engineer))).status).toBe(400)
    expect((await request(t.app).get('/api/compare?items=nope').set(bearer(engineer))).status).toBe(400)
    expect((await request(t.app).get(`/api/compare?${q([{ configurationId: ids.saved }])}`).set(bearer(colleague))).status).toBe(404)
  })
})

describe('GET /api/compare/csv and /pdf', () => {
  it('gives a CSV with one column per candidate', async () => {
    const res = await request(t.app).get(`/api/compare/csv?${q(items())}`).set(bearer(engineer))
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8')
    const rows = Papa.parse<string[]>(res.text.trim()).data
    expect(rows[0]).toEqual(['Quantity', 'Unit', 'Power switch, field node shell S1', 'Thin switch (saved)', 'Battery door hinge, field node shell S1'])
    expect(rows.every((r) => r.length === 5 || r.length === 2)).toBe(true)
    expect(rows.some((r) => r[0].startsWith('Printability:'))).toBe(true)
  })

  it('gives a one-page PDF naming every candidate', async () => {
    const res = await request(t.app).get(`/api/compare/pdf?${q(items())}`).set(bearer(engineer)).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c))
      r.on('end', () => done(null, Buffer.concat(chunks)))
    })
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    const pdf = readPdf(res.body)
    expect(pdf.pageCount).toBe(1)
    expect(pdf.text).toContain('Thin switch (saved)')
    expect(pdf.text).toContain('best')
    // a hinge (rotation, moment) gets its own plot beside the switches' (displacement, force)
    expect(pdf.text).toMatch(/Rotation \(deg\) across/)
    expect(pdf.text).toMatch(/candidates 3\b/)
    // marks the page's fonts (IBM Plex Sans Latin) have no glyph for are not written
    expect(pdf.text).not.toMatch(/[✓→]/)
  })
})
