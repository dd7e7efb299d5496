import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, makeTempDir, signInAs, startTestApp, type TestApp } from './helpers'

const INDEX_HTML = '<!doctype html><html><body><div id="app"></div><script src="/assets/app-1a2b.js"></script></body></html>'

describe('the web app', () => {
  describe('when dist/web has not been built', () => {
    let t: TestApp
    beforeAll(async () => {
      t = await startTestApp({ seed: false })
    })
    afterAll(() => t.close())

    it('answers every page with a text page saying to run npm run build', async () => {
      for (const path of ['/', '/shelf', '/entries/3']) {
        const res = await request(t.app).get(path)
        expect(res.status).toBe(503)
        expect(res.type).toBe('text/plain')
        expect(res.text).toContain('npm run build')
      }
    })

    it('still answers the API', async () => {
      const res = await request(t.app).get('/api/health')
      expect(res.status).toBe(200)
      expect(res.body).toEqual({ status: 'ok', version: expect.any(String), database: 'ok' })
    })
  })

  describe('when dist/web is built', () => {
    let t: TestApp
    let token: string
    beforeAll(async () => {
      const webDir = makeTempDir('flexshelf-web-')
      mkdirSync(join(webDir, 'assets'))
      writeFileSync(join(webDir, 'index.html'), INDEX_HTML)
      writeFileSync(join(webDir, 'assets', 'app-1a2b.js'), 'console.log("flexshelf")')
      t = await startTestApp({ config: { webDir } })
      token = await signInAs(t.app, 'engineer')
    })
    afterAll(() => t.close())

    it('serves index.html at the root', async () => {
      const res = await request(t.app).get('/')
      expect(res.status).toBe(200)
      expect(res.type).toBe('text/html')
      expect(res.text).toBe(INDEX_HTML)
    })

    it('serves index.html for the app\u2019s own routes (history mode)', async () => {
      const res = await request(t.app).get('/entries/12/configure')
      expect(res.status).toBe(200)
      expect(res.text).toBe(INDEX_HTML)
      expect(res.headers['cache-control']).toBe('no-cache')
    })

    it('serves hashed assets with a long cache lifetime', async () => {
      const res = await request(t.app).get('/assets/app-1a2b.js')
      expect(res.status).toBe(200)
      expect(res.text).toBe('console.log("flexshelf")')
      expect(res.headers['cache-control']).toContain('immutable')
    })

    describe('GET /api/<unknown> as an engineer', () => {
      it('answers 404 JSON, not the web app', async () => {
        const res = await request(t.app).get('/api/no-such-thing/here').set(bearer(token))
        expect(res.status).toBe(404)
        expect(res.type).toBe('application/json')
        expect(res.body).toEqual({ error: { code: 'not_found', message: 'no route for GET /api/no-such-thing/here', details: null } })
      })
    })

    describe('GET /api/<unknown> anonymously', () => {
      it('answers 401 JSON (deny by default comes first)', async () => {
        const res = await request(t.app).get('/api/no-such-thing')
        expect(res.status).toBe(401)
        expect(res.body.error.code).toBe('unauthenticated')
      })
    })

    describe('POST to a page path', () => {
      it('answers 404 JSON', async () => {
        const res = await request(t.app).post('/entries/12').send({})
        expect(res.status).toBe(404)
        expect(res.body.error.code).toBe('not_found')
      })
    })
  })
})
