/**
 * Issue 11: the requests of the report, against the app, each answered fast with a clear
 * message naming the field instead of stalling or killing the server.
 */
import { brotliCompressSync, gzipSync } from 'node:zlib'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { HSTS_VALUE } from '../../api/middleware/security-headers'
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

describe('finding 7: bodies that broke the server', () => {
  const broken = (packed: Buffer) => Buffer.concat([packed.subarray(0, 6), Buffer.from('not the rest of the stream')])
  for (const [encoding, packed] of [['gzip', gzipSync(Buffer.from('{"params":{}}'))], ['br', brotliCompressSync(Buffer.from('{"params":{}}'))], ['deflate', Buffer.from('not deflate at all')]] as const) {
    it(`answers 400 malformed_body for a ${encoding} body that does not decompress (it was 500)`, async () => {
      const res = await request(t.app).post('/api/families/leaf-hinge/evaluate').set(bearer(engineer))
        .set('Content-Type', 'application/json').set('Content-Encoding', encoding).serialize((b: Buffer) => b as unknown as string).send(broken(packed))
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('malformed_body')
      expect(res.body.error.message).toMatch(/could not be decompressed/)
    })
  }

  it('still reads a good gzip body', async () => {
    const res = await request(t.app).post('/api/families/leaf-hinge/evaluate').set(bearer(engineer))
      .set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').serialize((b: Buffer) => b as unknown as string).send(gzipSync(Buffer.from('{"params":{"length":8}}')))
    expect(res.status, JSON.stringify(res.body)).toBe(200)
  })

  it('answers 400 for a body nested 40,000 deep before any route sees it (it overflowed the stack: 500)', async () => {
    const deep = '{"a":'.repeat(40_000) + '1' + '}'.repeat(40_000)
    const res = await request(t.app).post('/api/families/leaf-hinge/evaluate').set(bearer(engineer)).set('Content-Type', 'application/json').send(`{"params":${deep}}`)
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues).toEqual([{ field: 'body', message: 'the request body is nested more than 32 levels deep' }])
    expect(t.logged).toEqual([])
  })
})

describe('finding 7: names and comments with control or bidirectional characters', () => {
  const signup = (displayName: string) => request(t.app).post('/api/auth/signup')
    .send({ email: `n${Math.random().toString(36).slice(2)}@example.test`, password: 'long enough password', displayName })

  for (const [what, name] of [['CR/LF', 'Evil\r\nX-Header: 1'], ['NUL', 'Nul\u0000Name'], ['the right-to-left override', 'Invoice \u202Efdp.exe'], ['a bidi isolate', 'A\u2066B']] as const) {
    it(`refuses ${what} in a display name, naming the field`, async () => {
      const res = await signup(name)
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues[0].field).toBe('displayName')
    })
  }

  it('refuses them in a saved configuration name', async () => {
    const res = await request(t.app).post('/api/configurations').set(bearer(engineer)).send({ entryId, name: 'Mine\u202Etxt.exe' })
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues[0]).toEqual({ field: 'name', message: 'name must not contain right-to-left or left-to-right override characters (U+202A–U+202E, U+2066–U+2069)' })
  })

  it('keeps line breaks in a comment but refuses NUL and the override', async () => {
    const contributor = await signInAs(t.app, 'contributor')
    const draft = await request(t.app).post('/api/entries').set(bearer(contributor))
      .send({ family: 'leaf-hinge', name: 'Comment test hinge', defaultParams: {}, ranges: {} })
    expect(draft.status, JSON.stringify(draft.body)).toBe(201)
    const path = `/api/entries/${draft.body.entry.id}/comments`
    expect((await request(t.app).post(path).set(bearer(contributor)).send({ text: 'Two lines:\nsecond line' })).status).toBe(201)
    for (const text of ['bad\u0000byte', 'flip \u202E this']) {
      const res = await request(t.app).post(path).set(bearer(contributor)).send({ text })
      expect(res.status, text).toBe(400)
      expect(res.body.error.details.issues[0].field).toBe('text')
    }
  })
})

describe('finding 8: HSTS', () => {
  it('is not sent over plain HTTP', async () => {
    const res = await request(t.app).get('/api/health')
    expect(res.headers['strict-transport-security']).toBeUndefined()
  })

  it('is sent when the trusted proxy says the request came over TLS', async () => {
    const res = await request(t.app).get('/api/health').set('X-Forwarded-Proto', 'https')
    expect(res.headers['strict-transport-security']).toBe(HSTS_VALUE)
  })
})
