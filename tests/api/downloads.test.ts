/**
 * Files out of an entry: GET /api/entries/:id/stl and GET /api/entries/:id/datasheet.pdf.
 * The STL is read back with catalog/geometry/mesh-check.ts; the PDF with tests/api/pdf-text.ts.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { getFamily, validateParams } from '../../catalog'
import { checkStl } from '../../catalog/geometry/mesh-check'
import { RETIRED_NOTICE } from '../../api/services/configure'
import { DATASHEET_CAUTIONS } from '../../api/services/datasheet'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'
import { readPdf } from './pdf-text'

let t: TestApp
let engineer: string
const ids = { switch: 0, hook: 0, hinge: 0, retired: 0 }

const q = (value: unknown) => encodeURIComponent(JSON.stringify(value))

/** Collects a binary body whatever its content type. */
function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => done(null, Buffer.concat(chunks)))
}

const download = (path: string) => request(t.app).get(path).set(bearer(engineer)).buffer(true).parse(binary)

beforeAll(async () => {
  t = await startTestApp()
  const { Entry, User } = t.context.db.models
  const byName = async (name: string) => (await Entry.findOne({ where: { name } }))!.id
  ids.switch = await byName('Power switch, field node shell S1')
  ids.hook = await byName('Battery door snap hook, field node shell S1')
  ids.hinge = await byName('Battery door hinge, field node shell S1')
  const librarian = (await User.findOne({ where: { email: demoEmail('librarian') } }))!
  ids.retired = (await Entry.create({
    familyId: 'leaf-hinge', name: 'Retired lid hinge', summary: '', tags: [], status: 'retired', defaultParams: { length: 4 },
    ranges: { length: [3, 6] }, materials: [], ownerId: librarian.id, currentRevisionId: null,
  })).id
  engineer = await signInAs(t.app, 'engineer')
})
afterAll(() => t.close())

function expectPrintableMesh(bytes: Buffer, familyId: string, params: Record<string, number | string>) {
  const report = checkStl(new Uint8Array(bytes))
  expect(report.triangleCount).toBe(report.headerCount)
  expect(report.unpairedEdges, 'every edge shared by exactly two triangles').toBe(0)
  expect(report.orientationErrors).toBe(0)
  expect(report.volume).toBeGreaterThan(0)
  const family = getFamily(familyId)
  const envelope = family.envelope(validateParams(family, params).params)
  // equal to a micrometre: JSCAD snaps vertices to its epsilon and STL stores float32
  const observed = report.box.size
  const expected = [envelope.x, envelope.y, envelope.z]
  observed.forEach((size, k) => expect(Math.abs(size - expected[k]), `box axis ${k}`).toBeLessThanOrEqual(1e-3))
}

describe('GET /api/entries/:id/stl', () => {
  describe('for a snap hook with parameters', () => {
    const params = { length: 14, rootThickness: 1.8, tipThickness: 1.1, width: 7, undercut: 1, entryAngle: 30, retainAngle: 60, friction: 0.4 }
    let res: request.Response
    beforeAll(async () => {
      res = await download(`/api/entries/${ids.hook}/stl?params=${q(params)}`)
    })

    it('streams a binary STL with a file name that says what it is', () => {
      expect(res.status).toBe(200)
      expect(res.headers['content-type']).toBe('model/stl')
      expect(res.headers['content-disposition']).toBe('attachment; filename="battery-door-snap-hook-field-snap-hook-length14-rt1.8-tt1.1-width7-u1-ea30-ra60-f0.4.stl"')
      expect(res.headers['flexshelf-notice']).toBeUndefined()
    })

    it('reads back closed, outward and the size of the family\u2019s envelope', () => {
      expectPrintableMesh(res.body, 'snap-hook', params)
    })

    it('gives the same bytes for the same parameters and other bytes for others', async () => {
      const again = await download(`/api/entries/${ids.hook}/stl?params=${q(params)}`)
      expect(Buffer.compare(again.body, res.body)).toBe(0)
      const other = await download(`/api/entries/${ids.hook}/stl?params=${q({ ...params, length: 13 })}`)
      expect(Buffer.compare(other.body, res.body)).not.toBe(0)
      expect(other.headers['content-disposition']).toMatch(/-length13-/)
    })
  })

  describe('for a bistable switch at its entry defaults', () => {
    it('reads back closed, outward and the size of the family\u2019s envelope', async () => {
      const res = await download(`/api/entries/${ids.switch}/stl`)
      expect(res.status).toBe(200)
      expect(res.headers['content-disposition']).toBe('attachment; filename="power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.7-depth6-pl0.stl"')
      expectPrintableMesh(res.body, 'bistable-beam', { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 })
    })
  })

  describe('with a parameter outside the entry\u2019s range', () => {
    it('answers 400 naming it', async () => {
      const res = await request(t.app).get(`/api/entries/${ids.hook}/stl?params=${q({ length: 20 })}`).set(bearer(engineer))
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toEqual(['length'])
    })
  })

  describe('with params that are not JSON', () => {
    it('answers 400 naming params', async () => {
      const res = await request(t.app).get(`/api/entries/${ids.hook}/stl?params=length%3D12`).set(bearer(engineer))
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'params', message: expect.stringMatching(/URL-encoded JSON/) }])
    })
  })

  describe('for an unknown entry', () => {
    it('answers 404', async () => {
      expect((await request(t.app).get('/api/entries/424242/stl').set(bearer(engineer))).status).toBe(404)
    })
  })

  describe('for a retired entry', () => {
    it('still streams the STL, with the notice in the Flexshelf-Notice header', async () => {
      const res = await download(`/api/entries/${ids.retired}/stl`)
      expect(res.status).toBe(200)
      expect(res.headers['flexshelf-notice']).toBe(RETIRED_NOTICE)
      expectPrintableMesh(res.body, 'leaf-hinge', { length: 4 })
    })
  })
})

describe('GET /api/entries/:id/datasheet.pdf', () => {
  describe('for a bistable switch with a window and a tolerance', () => {
    let res: request.Response
    let sheet: { parameters: Array<{ label: string; value: number }>; metrics: Array<{ label: string }>; cautions: string[] }
    const query = `params=${q({ thickness: 0.8 })}&method=closed-form&window=${q({ kind: 'bistable', peakForce: { min: 1, max: 20 } })}&tolerance=${q({ thickness: 0.04, modulus: 0.15 })}&printer=${q({ nozzle: 0.4, layer: 0.2 })}`
    beforeAll(async () => {
      res = await download(`/api/entries/${ids.switch}/datasheet.pdf?${query}`)
      sheet = (await request(t.app).get(`/api/entries/${ids.switch}/datasheet?${query}`).set(bearer(engineer))).body.datasheet
    })

    it('answers a PDF download named for the part', () => {
      expect(res.status).toBe(200)
      expect(res.headers['content-type']).toBe('application/pdf')
      expect(res.headers['content-disposition']).toBe('attachment; filename="power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.8-depth6-pl0-datasheet.pdf"')
      expect(res.body.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    })

    it('has two A4 pages: the part, then the judgement', () => {
      const pdf = readPdf(res.body)
      expect(pdf.pageCount).toBe(2)
      expect(pdf.pages[0].join(' ')).toMatch(/Predicted curve/)
      expect(pdf.pages[1].join(' ')).toMatch(/Cautions/)
    })

    it('shows the parameters, the metrics, the tolerance, the method, the cautions and the date from the same builder as the JSON', () => {
      const { text } = readPdf(res.body)
      expect(text).toContain('Power switch, field node shell S1')
      for (const p of sheet.parameters) expect(text).toContain(p.label)
      expect(text).toContain('Beam thickness 0.8 mm')
      for (const m of sheet.metrics) expect(text).toContain(m.label)
      expect(text).toContain('Tolerance band: walls ±0.04 mm, modulus ±15 %')
      expect(text).toContain('Two-mode closed form (closed-form)')
      expect(text).toContain('Printability on a 0.4 mm nozzle at 0.2 mm layers (common practice)')
      // the merged list (tests/api/cautions.test.ts): the family's own cautions and the one on codes and review
      for (const caution of sheet.cautions) expect(text).toContain(caution.slice(0, 60))
      expect(text).toContain(DATASHEET_CAUTIONS[DATASHEET_CAUTIONS.length - 1].slice(0, 60))
      expect(text).toContain(`generated ${new Date().toISOString().slice(0, 10)}`)
    })
  })

  describe('for a retired entry', () => {
    it('answers the PDF with the notice in the header and on the sheet', async () => {
      const res = await download(`/api/entries/${ids.retired}/datasheet.pdf?method=prbm`)
      expect(res.status).toBe(200)
      expect(res.headers['flexshelf-notice']).toBe(RETIRED_NOTICE)
      expect(readPdf(res.body).text).toContain(RETIRED_NOTICE)
    })
  })

  describe('with a bad tolerance', () => {
    it('answers 400 naming it', async () => {
      const res = await request(t.app).get(`/api/entries/${ids.hinge}/datasheet.pdf?tolerance=${q({ modulus: 2 })}`).set(bearer(engineer))
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toEqual(['tolerance.modulus'])
    })
  })
})
