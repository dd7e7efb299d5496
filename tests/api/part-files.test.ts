/**
 * GET /api/entries/:id/3mf|dxf|svg and the same for saved and shared configurations, read
 * back with general-purpose parsers (fflate, fast-xml-parser, dxf-parser). The file checks
 * themselves (watertight, volumes) are in tests/catalog/files/part-files.test.ts.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { strFromU8, unzipSync } from 'fflate'
import { XMLParser } from 'fast-xml-parser'
import DxfParser from 'dxf-parser'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let engineer: string
let colleague: string
const ids = { switch: 0, hinge: 0 }
const q = (value: unknown) => encodeURIComponent(JSON.stringify(value))

function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => done(null, Buffer.concat(chunks)))
}
const download = (path: string, token = engineer) => request(t.app).get(path).set(bearer(token)).buffer(true).parse(binary)

beforeAll(async () => {
  t = await startTestApp()
  const { Entry } = t.context.db.models
  ids.switch = (await Entry.findOne({ where: { name: 'Power switch, field node shell S1' } }))!.id
  ids.hinge = (await Entry.findOne({ where: { name: 'Battery door hinge, field node shell S1' } }))!.id
  engineer = await signInAs(t.app, 'engineer')
  colleague = await signInAs(t.app, 'contributor')
})
afterAll(() => t.close())

describe('GET /api/entries/:id/3mf', () => {
  it('answers a 3MF package in millimetres whose object is named after the entry, with its metadata', async () => {
    const res = await download(`/api/entries/${ids.switch}/3mf?params=${q({ span: 60, material: 'petg' })}`)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('model/3mf')
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="power-switch-field-node-shell-s1-bistable-beam-span60-.*\.3mf"$/)
    const model = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '' }).parse(strFromU8(unzipSync(new Uint8Array(res.body))['3D/3dmodel.model'])).model
    expect(model.unit).toBe('millimeter')
    expect(model.resources.object.name).toBe('Power switch, field node shell S1')
    const meta = Object.fromEntries(model.metadata.map((m: { name: string; '#text': unknown }) => [m.name, String(m['#text'])]))
    expect(meta['flexshelf:entry']).toBe(String(ids.switch))
    expect(meta['flexshelf:material']).toMatch(/\(petg\)$/)
    expect(meta['flexshelf:parameters']).toContain('span=60')
    expect(Number(meta['flexshelf:revision'])).toBeGreaterThanOrEqual(1)
  })

  it('refuses parameters outside the entry\u2019s ranges, naming the field, before building anything', async () => {
    const res = await request(t.app).get(`/api/entries/${ids.switch}/3mf?params=${q({ span: 1e9 })}`).set(bearer(engineer))
    expect(res.status).toBe(400)
    expect(JSON.stringify(res.body)).toContain('span')
  })
})

describe('GET /api/entries/:id/dxf and /svg', () => {
  it('answers the hinge profile as DXF in millimetres, the depth in the file and its name', async () => {
    const res = await download(`/api/entries/${ids.hinge}/dxf?params=${q({ depth: 18 })}`)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('image/vnd.dxf; charset=utf-8')
    expect(res.headers['content-disposition']).toMatch(/-profile-extrude18mm\.dxf"$/)
    const dxf = new DxfParser().parseSync(res.body.toString('utf8'))!
    expect(dxf.header.$INSUNITS).toBe(4)
    for (const e of dxf.entities as unknown as { type: string; shape: boolean; depth: number }[]) {
      expect(e.type).toBe('LWPOLYLINE')
      expect(e.shape).toBe(true)
      expect(e.depth).toBeCloseTo(18, 3)
    }
    expect(res.body.toString('utf8')).toContain('Extrude 18 mm along +Z')
  })

  it('answers an SVG drawing of the profile', async () => {
    const res = await request(t.app).get(`/api/entries/${ids.hinge}/svg`).set(bearer(engineer)).buffer(true).parse(binary)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('image/svg+xml; charset=utf-8')
    const svg = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '' }).parse(res.body.toString('utf8')).svg
    expect(svg.title).toBe('Battery door hinge, field node shell S1 — profile, mm')
  })
})

describe('part files of saved and shared configurations', () => {
  it('are the same files as from the entry with the saved parameters; a share link gives them to a colleague', async () => {
    const params = { length: 5, depth: 16 }
    const saved = await request(t.app).post('/api/configurations').set(bearer(engineer)).send({ entryId: ids.hinge, name: 'Hinge for the files test', params })
    expect(saved.status).toBe(201)
    const id = saved.body.configuration.id
    const own = await download(`/api/configurations/${id}/3mf`)
    expect(own.status).toBe(200)
    const fromEntry = await download(`/api/entries/${ids.hinge}/3mf?params=${q({ ...params, material: saved.body.configuration.params.material })}`)
    expect(Buffer.compare(own.body, fromEntry.body)).toBe(0)
    expect((await download(`/api/configurations/${id}/dxf`, colleague)).status).toBe(404)
    const token = (await request(t.app).post(`/api/configurations/${id}/share`).set(bearer(engineer))).body.shareToken
    const shared = await download(`/api/shared/${token}/dxf`, colleague)
    expect(shared.status).toBe(200)
    expect(shared.body.toString('utf8')).toBe((await download(`/api/configurations/${id}/dxf`)).body.toString('utf8'))
    expect((await download(`/api/shared/${token}/svg`, colleague)).status).toBe(200)
  })
})
