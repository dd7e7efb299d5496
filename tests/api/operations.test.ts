/** The operator's view: JSON request logs, GET /api/ready and Prometheus metrics at /metrics. */
import { Writable } from 'node:stream'
import pino from 'pino'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../api/app'
import { families } from '../../catalog'
import { bearer, demoEmail, signIn, startTestApp, type TestApp } from './helpers'

const METRICS_TOKEN = 'mX8-qL2wZr7NvB4kTy9PcJ1sHd6GfA3e'

const lines: Array<Record<string, unknown>> = []
const sink = new Writable({
  write(chunk, _enc, done) {
    for (const line of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(line))
    done()
  },
})

let t: TestApp
let app: ReturnType<typeof createApp>
beforeAll(async () => {
  t = await startTestApp({ config: { metricsToken: METRICS_TOKEN } })
  app = createApp(t.context, { log: () => {}, logger: pino({ level: 'info' }, sink) })
})
afterAll(() => t.close())

const lastLine = () => lines[lines.length - 1]

describe('the request log', () => {
  it('writes one JSON line per request with id, route pattern, status, duration and user', async () => {
    const token = await signIn(app, demoEmail('engineer'))
    const res = await request(app).get('/api/entries/1').set(bearer(token)).set('X-Request-Id', 'trace-abc-123')
    expect(res.headers['x-request-id']).toBe('trace-abc-123')
    const line = lastLine()
    expect(line).toMatchObject({ req: { id: 'trace-abc-123', method: 'GET', url: '/api/entries/1' }, res: { status: res.status }, route: '/api/entries/:id' })
    expect(line.userId).toEqual(expect.any(Number))
    expect(line.durationMs).toEqual(expect.any(Number))
  })

  it('gives a fresh id when none (or a malformed one) is sent', async () => {
    const res = await request(app).get('/api/health').set('X-Request-Id', 'bad id with spaces')
    expect(res.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/)
  })

  it('never holds a password, a token or a reset link', async () => {
    const before = lines.length
    const session = await signIn(app, demoEmail('admin'))
    await request(app).post('/api/auth/signin').send({ email: demoEmail('admin'), password: 'a wrong guess entirely' })
    await request(app).post('/api/auth/password-reset/confirm').send({ token: 'R3setT0kenValueThatMustNotLeak_123456', newPassword: 'tender violet marsh 4' })
    await request(app).get('/reset-password?token=R3setT0kenValueThatMustNotLeak_123456')
    await request(app).get('/api/shared/Sh4reTokenThatMustNotLeak_987654').set(bearer(session))
    await request(app).get('/api/auth/me').set(bearer(session))
    const text = JSON.stringify(lines.slice(before))
    for (const secret of ['flexshelf-demo', 'a wrong guess', 'R3setT0ken', 'Sh4reToken', session, 'tender violet']) expect(text).not.toContain(secret)
    expect(text).toContain('/reset-password?token=[redacted]')
    expect(text).toContain('"url":"/api/shared/[redacted]"')
  })
})

describe('GET /api/ready', () => {
  it('answers 200 with each check when the database answers', async () => {
    const res = await request(app).get('/api/ready')
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ status: 'ready', checks: { database: { status: 'ok', ms: expect.any(Number) } } })
  })

  it('answers 503 naming the database when it does not', async () => {
    const broken = await startTestApp({ seed: false })
    await broken.context.db.close()
    const res = await request(broken.app).get('/api/ready')
    expect(res.status).toBe(503)
    expect(res.body.status).toBe('not_ready')
    expect(res.body.checks.database.status).toBe('failed')
    await broken.close().catch(() => {})
  })
})

describe('GET /metrics', () => {
  it('answers 404 without FLEXSHELF_METRICS_TOKEN', async () => {
    const plain = await startTestApp({ seed: false })
    try {
      const res = await request(plain.app).get('/metrics')
      expect(res.status).toBe(404)
      expect(res.body.error.message).toContain('FLEXSHELF_METRICS_TOKEN')
    } finally {
      await plain.close()
    }
  })

  it('answers 401 without the token or with a wrong one', async () => {
    expect((await request(app).get('/metrics')).status).toBe(401)
    expect((await request(app).get('/metrics').set(bearer('not-the-token'))).status).toBe(401)
  })

  function sample(text: string, name: string, labels: Record<string, string> = {}): number {
    const wanted = Object.entries(labels).map(([k, v]) => `${k}="${v}"`)
    const line = text.split('\n').find((l) => l.startsWith(name) && (l[name.length] === '{' || l[name.length] === ' ') && wanted.every((w) => l.includes(w)))
    return line ? Number(line.slice(line.lastIndexOf(' ') + 1)) : 0
  }
  const scrape = async () => (await request(app).get('/metrics').set(bearer(METRICS_TOKEN)).expect(200)).text

  it('counts requests by route, compute jobs, searches and sign-in failures', async () => {
    const before = await scrape()
    const token = await signIn(app, demoEmail('engineer'))
    await request(app).get('/api/entries').set(bearer(token)).expect(200)
    await request(app).post(`/api/families/${families[0].id}/evaluate`).set(bearer(token)).send({ params: {} }).expect(200)
    await request(app).post('/api/auth/signin').send({ email: demoEmail('engineer'), password: 'surely not this one' }).expect(401)
    await request(app).post('/api/search').set(bearer(token)).send({ kind: 'spring', stiffness: { min: 0.1, max: 1 }, limit: 3 })
    const after = await scrape()
    const delta = (name: string, labels: Record<string, string> = {}) => sample(after, name, labels) - sample(before, name, labels)
    expect(delta('flexshelf_http_request_duration_seconds_count', { route: '/api/entries', method: 'GET', status: '200' })).toBe(1)
    expect(delta('flexshelf_compute_job_duration_seconds_count', { kind: 'evaluate', outcome: 'ok' })).toBe(1)
    expect(delta('flexshelf_signin_failures_total', { reason: 'wrong_credentials' })).toBe(1)
    expect(delta('flexshelf_searches_total', { kind: 'direct' })).toBe(1)
    expect(after).toMatch(/^flexshelf_compute_queue_depth 0$/m)
    expect(after).not.toMatch(/flexshelf_queue_/) // the shared queue's gauges only with FLEXSHELF_REDIS_URL
    expect(after).toMatch(/^flexshelf_process_resident_memory_bytes \d+/m)
  })
})
