/**
 * Issue 11: the requests of the report, against the app, each answered fast with a clear
 * message naming the field instead of stalling or killing the server.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let engineer: string
let entryId: number

beforeAll(async () => {
  t = await startTestApp()
  engineer = await signInAs(t.app, 'engineer')
  entryId = (await t.context.db.models.Entry.findOne({ where: { name: 'Power switch, field node shell S1' } }))!.id
})
afterAll(() => t.close())

const fieldsOf = (res: request.Response) => res.body.error.details.issues.map((i: { field: string }) => i.field)

describe('finding 1: a printer below the physical bounds', () => {
  it('is refused by the check with 400 naming printer.nozzle (it made the check loop until Node ran out of memory)', async () => {
    const res = await request(t.app).post(`/api/entries/${entryId}/check`).set(bearer(engineer)).send({ printer: { nozzle: 1e-300 } })
    expect(res.status).toBe(400)
    expect(fieldsOf(res)).toEqual(['printer.nozzle'])
    expect(res.body.error.message).toBe('printer.nozzle must be from 0.1 to 2 mm')
  })

  it('refuses a 7e-7 mm layer (one check took 7.6 s)', async () => {
    const res = await request(t.app).post(`/api/entries/${entryId}/check`).set(bearer(engineer)).send({ printer: { nozzle: 0.4, layer: 7e-7 } })
    expect(res.status).toBe(400)
    expect(fieldsOf(res)).toEqual(['printer.layer'])
  })

  it('refuses it in a download link, a one-shot search and a search job (the job was accepted with 202)', async () => {
    const q = encodeURIComponent(JSON.stringify({ nozzle: 1e-300 }))
    const stl = await request(t.app).get(`/api/entries/${entryId}/datasheet?printer=${q}`).set(bearer(engineer))
    expect(stl.status).toBe(400)
    expect(fieldsOf(stl)).toEqual(['printer.nozzle'])
    const window = { kind: 'bistable', peakForce: { min: 1, max: 9 }, printer: { nozzle: 1e-300 } }
    for (const path of ['/api/search', '/api/searches']) {
      const res = await request(t.app).post(path).set(bearer(engineer)).send(window)
      expect(res.status, path).toBe(400)
      expect(fieldsOf(res), path).toEqual(['printer.nozzle'])
    }
  })

  it('refuses a tolerance over 1 mm or 50 % by field', async () => {
    const res = await request(t.app).post(`/api/entries/${entryId}/check`).set(bearer(engineer)).send({ tolerance: { thickness: 3, modulus: 0.8 } })
    expect(res.status).toBe(400)
    expect(fieldsOf(res).sort()).toEqual(['tolerance.modulus', 'tolerance.thickness'])
  })
})
