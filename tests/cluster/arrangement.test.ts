/**
 * The several-instance arrangement on loopback (README, "Running on several machines"):
 * PostgreSQL, Redis and the S3 fake started here; two API instances started at the same moment
 * (one seed between them) and two workers. What one instance writes the other reads; a worker
 * killed with SIGKILL in the middle of evaluations and of searches leaves every request with one
 * answer, the same as the undisturbed run; an API instance killed in the middle of writes loses
 * nothing it acknowledged.
 */
import { execFile } from 'node:child_process'
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_USERS } from '../../api/db/demo-shelf'
import { api, startArrangement, type Arrangement, type Proc } from '../../scripts/support/arrangement'
import { parseEventStream, type StreamEvent } from '../api/sse'

let a: Arrangement
let one: Proc
let two: Proc
let workers: Proc[]
const token = {} as Record<string, string>
const email = (role: string) => DEMO_USERS.find((u) => u.role === role)!.email
let switchId: number
const METRICS_TOKEN = 'Qm7-arrangement-Vx2pL9wKc4TzR8nB3hYd6Fj0Gs5'
const withMetrics = { FLEXSHELF_METRICS_TOKEN: METRICS_TOKEN }

/** One sample of a Prometheus text exposition (null when the series is absent). */
function sample(text: string, name: string, labels: Record<string, string>): number | null {
  const wanted = Object.entries(labels).map(([k, v]) => `${k}="${v}"`)
  const line = text.split('\n').find((l) => l.startsWith(`${name}{`) && wanted.every((w) => l.includes(w)))
  return line ? Number(line.slice(line.lastIndexOf(' ') + 1)) : null
}

beforeAll(async () => {
  a = await startArrangement()
  ;[one, two] = await Promise.all([a.startApi('api-1', withMetrics), a.startApi('api-2', withMetrics)])
  workers = await Promise.all([a.startWorker('worker-1'), a.startWorker('worker-2')])
  for (const role of ['engineer', 'contributor', 'librarian']) {
    const res = await api(one.url!, '/api/auth/signin', null, { body: { email: email(role), password: DEMO_PASSWORD } })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    token[role] = res.body.token
  }
  const shelf = await api(two.url!, '/api/shelf', token.engineer)
  switchId = shelf.body.entries.find((e: { name: string }) => e.name === 'Power switch, field node shell S1').id
}, 240_000)

afterAll(async () => {
  await a?.stop()
})

describe('two API instances on one PostgreSQL, Redis and bucket', () => {
  it('seeded the demo data once although both started at the same moment', async () => {
    const seeded = [one, two].map((p) => p.output.join('').match(/Demo data: (\d+) users, (\d+) materials, (\d+) entries/)!.slice(1).map(Number))
    expect(seeded[0][0] + seeded[1][0]).toBe(DEMO_USERS.length)
    const shelves = await Promise.all([one, two].map((p) => api(p.url!, '/api/shelf', token.engineer)))
    expect(shelves[0].body.entries.length).toBeGreaterThan(3)
    expect(shelves[1].body.entries.map((e: { id: number }) => e.id)).toEqual(shelves[0].body.entries.map((e: { id: number }) => e.id))
    const ready = await api(two.url!, '/api/ready', null)
    expect(ready.status, JSON.stringify(ready.body)).toBe(200)
    expect(ready.body.checks.queue.status).toBe('ok')
  })

  it('lists on one instance a configuration saved on the other', async () => {
    const entry = (await api(one.url!, `/api/entries/${switchId}`, token.engineer)).body
    const saved = await api(one.url!, '/api/configurations', token.engineer, { body: { entryId: switchId, name: 'Saved on instance one', params: entry.entry?.defaultParams ?? entry.defaultParams } })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    const listed = await api(two.url!, '/api/configurations', token.engineer)
    expect(JSON.stringify(listed.body)).toContain('Saved on instance one')
  })

  it('downloads from one instance a report uploaded on the other', async () => {
    const csv = 'displacement,force\n0,0\n0.2,0.4\n0.4,0.7\n0.6,0.9\n0.8,1.0\n1.0,1.05\n'
    const form = new FormData()
    for (const [k, v] of Object.entries({ printer: 'Bench printer 2', material: 'PETG', testSpeed: '10' })) form.append(k, v)
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'stand-run.csv')
    const up = await fetch(`${one.url}/api/entries/${switchId}/reports`, { method: 'POST', headers: { Authorization: `Bearer ${token.contributor}` }, body: form })
    const report = await up.json()
    expect(up.status, JSON.stringify(report)).toBe(201)
    const down = await fetch(`${two.url}/api/reports/${report.report.id}/file`, { headers: { Authorization: `Bearer ${token.contributor}` } })
    expect(down.status).toBe(200)
    expect(await down.text()).toContain('0.4,0.7')
  })

  it('takes a retire on one instance off the other\'s shelf list within a second', async () => {
    const before = await api(two.url!, '/api/shelf', token.engineer) // cached on instance two now
    const victim = before.body.entries.find((e: { id: number }) => e.id !== switchId)
    const retired = await api(one.url!, `/api/entries/${victim.id}/retire`, token.librarian, { body: {} })
    expect(retired.status, JSON.stringify(retired.body)).toBe(200)
    const deadline = Date.now() + 1000
    let listed = true
    while (listed && Date.now() < deadline) {
      listed = (await api(two.url!, '/api/shelf', token.engineer)).body.entries.some((e: { id: number }) => e.id === victim.id)
      if (listed) await new Promise((r) => setTimeout(r, 50))
    }
    expect(listed).toBe(false)
  })

  it('shares the sign-in delays: failures on one instance slow the next attempt on the other', async () => {
    for (let i = 0; i < 12; i++) {
      const res = await api(i % 2 ? one.url! : two.url!, '/api/auth/signin', null, { body: { email: email('admin'), password: 'not the password' } })
      if (res.status === 429) return
    }
    throw new Error('twelve wrong passwords over two instances were never slowed down')
  })

  it('lifts those delays on every instance with the admin command line\'s unlock', async () => {
    const delayed = await api(one.url!, '/api/auth/signin', null, { body: { email: email('admin'), password: DEMO_PASSWORD } })
    expect(delayed.status).toBe(429) // the right password too, while the delay lasts
    const cli = await promisify(execFile)(process.execPath, ['--import', 'tsx', 'api/cli/admin.ts', 'unlock', '--email', email('admin')], {
      cwd: join(import.meta.dirname, '..', '..'),
      env: { ...process.env, ...a.env, FLEXSHELF_DATA: mkdtempSync(join(tmpdir(), 'flexshelf-cli-')) },
    })
    expect(cli.stderr).toContain('is unlocked')
    for (const p of [one, two]) {
      const res = await api(p.url!, '/api/auth/signin', null, { body: { email: email('admin'), password: DEMO_PASSWORD } })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
    }
  })

  it('reports the shared queues in /metrics: jobs by state and the two workers on each queue', async () => {
    const res = await fetch(`${two.url}/metrics`, { headers: { Authorization: `Bearer ${METRICS_TOKEN}` } })
    expect(res.status).toBe(200)
    const text = await res.text()
    for (const queue of ['flexshelf-compute', 'flexshelf-search']) {
      expect(sample(text, 'flexshelf_queue_workers', { queue })).toBe(2)
      for (const state of ['waiting', 'active', 'failed', 'delayed']) expect(sample(text, 'flexshelf_queue_jobs', { queue, state })).toBe(0)
    }
  })
})

describe('search jobs seen from every instance', () => {
  const windowOf = (i: number) => ({ kind: 'bistable', peakForce: { min: 2, max: 9 + i }, materials: ['petg'] })
  const start = (p: Proc, i: number) => api(p.url!, '/api/searches', token.engineer, { body: windowOf(i) })
  /** Opens a job's event stream; resolves once it is open, with the events it will have carried when it ends. */
  async function openEvents(p: Proc, id: string): Promise<{ ended: Promise<StreamEvent[]> }> {
    const res = await fetch(`${p.url}/api/searches/${id}/events`, { headers: { Authorization: `Bearer ${token.engineer}` } })
    expect(res.status).toBe(200)
    // wrapped: an async function answering a promise would wait for it (the stream's end)
    return { ended: res.text().then(parseEventStream) }
  }
  const pause = (signal: 'SIGSTOP' | 'SIGCONT') => { for (const w of workers) w.child.kill(signal) }

  it('holds the three-search limit over both instances, and follows and cancels on one instance a search started on the other', async () => {
    // the workers held still, so the searches are certainly still running while they are counted and cancelled
    pause('SIGSTOP')
    let ids: string[] = []
    let cancelled = ''
    try {
      for (let i = 0; i < 3; i++) {
        const res = await start(one, i)
        expect(res.status, JSON.stringify(res.body)).toBe(202)
        ids.push(res.body.id)
      }
      const fourth = await start(two, 3)
      expect(fourth.status).toBe(429)
      expect(fourth.body.error.message).toMatch(/3 searches running/)
      const direct = await api(two.url!, '/api/search', token.engineer, { body: windowOf(4) })
      expect(direct.status).toBe(429)

      cancelled = ids[0]
      expect((await api(two.url!, `/api/searches/${cancelled}`, token.engineer)).body).toMatchObject({ id: cancelled, status: 'running', result: null })
      expect((await api(two.url!, `/api/searches/${cancelled}`, token.contributor)).status).toBe(404)
      const onTwo = await openEvents(two, cancelled)
      const onOne = await openEvents(one, cancelled)
      expect((await api(two.url!, `/api/searches/${cancelled}`, token.engineer, { method: 'DELETE' })).status).toBe(204)
      for (const events of [await onTwo.ended, await onOne.ended]) expect(events.map((e) => e.event), JSON.stringify(events)).toEqual(['cancelled'])
      expect((await api(one.url!, `/api/searches/${cancelled}`, token.engineer)).body.status).toBe('cancelled')
      // the cancel freed its place at once, on every instance
      const replacement = await start(two, 5)
      expect(replacement.status, JSON.stringify(replacement.body)).toBe(202)
      ids = [...ids.slice(1), replacement.body.id]
    } finally {
      pause('SIGCONT')
    }

    // the others run now: each one's progress and result reach the instance that did not start it
    for (const [id, other] of [[ids[0], two], [ids[1], two], [ids[2], one]] as const) {
      const events = await (await openEvents(other, id)).ended
      expect(events.some((e) => e.event === 'progress'), JSON.stringify(events).slice(0, 300)).toBe(true)
      expect(events.at(-1)!.event, JSON.stringify(events.at(-1)).slice(0, 300)).toBe('result')
      const state = await api(other.url!, `/api/searches/${id}`, token.engineer)
      expect(state.body).toMatchObject({ status: 'done', error: null })
      expect(state.body.result.results).toEqual((events.at(-1)!.data as { results: unknown[] }).results)
    }
    // the cancelled one stays cancelled once the workers are back, with no result
    expect((await api(two.url!, `/api/searches/${cancelled}`, token.engineer)).body).toMatchObject({ status: 'cancelled', result: null })
  })
})

describe('a worker killed with SIGKILL', () => {
  const check = () => api(two.url!, `/api/entries/${switchId}/check`, token.engineer, { body: { method: 'nonlinear-fe' } })

  it('in the middle of evaluations: every request still gets its one answer, the undisturbed one', async () => {
    const reference = await check()
    expect(reference.status, JSON.stringify(reference.body)).toBe(200)
    const requests = Array.from({ length: 4 }, () => check())
    await new Promise((r) => setTimeout(r, 300))
    await a.kill(workers[0])
    const answers = await Promise.all(requests)
    for (const res of answers) {
      expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200)
      expect(res.body.metrics ?? res.body.band?.nominal?.metrics).toEqual(reference.body.metrics ?? reference.body.band?.nominal?.metrics)
    }
    workers[0] = await a.startWorker('worker-3')
  })

  it('in the middle of searches: every search still gets its one answer', async () => {
    const evaluation = await api(one.url!, '/api/families/bistable-beam/evaluate', token.engineer, { body: { params: { material: 'petg' } } })
    expect(evaluation.status, JSON.stringify(evaluation.body).slice(0, 300)).toBe(200)
    const peak = evaluation.body.metrics.peakForce as number
    // the window of tests/api/search.test.ts around one switch, narrowed to one material
    const windowOf = (f: number) => ({ kind: 'bistable', peakForce: { min: 0.7 * peak * f, max: 1.3 * peak * f }, materials: ['petg'] })
    const reference = await api(one.url!, '/api/search', token.engineer, { body: windowOf(1) })
    expect(reference.status, JSON.stringify(reference.body).slice(0, 300)).toBe(200)
    // distinct windows, so no answer comes from the search cache
    const searches = [1.01, 1.02].map((f) => api(one.url!, '/api/search', token.engineer, { body: windowOf(f) }))
    await new Promise((r) => setTimeout(r, 150))
    await a.kill(workers[1])
    const answers = await Promise.all(searches)
    for (const res of answers) {
      expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200)
      expect(Array.isArray(res.body.results ?? res.body.matches)).toBe(true)
    }
    workers[1] = await a.startWorker('worker-4')
  })
})

describe('an API instance killed with SIGKILL in the middle of writes', () => {
  it('loses nothing it acknowledged: every saved configuration it answered 201 is listed on the other', async () => {
    const entry = (await api(two.url!, `/api/entries/${switchId}`, token.engineer)).body
    const params = entry.entry?.defaultParams ?? entry.defaultParams
    const acknowledged: number[] = []
    const writes = Array.from({ length: 40 }, (_, i) => api(one.url!, '/api/configurations', token.engineer, { body: { entryId: switchId, name: `Written before the crash ${i}`, params } })
      .then((res) => { if (res.status === 201) acknowledged.push(res.body.configuration?.id ?? res.body.id) })
      .catch(() => undefined))
    await new Promise((r) => setTimeout(r, 150))
    await a.kill(one)
    await Promise.all(writes)
    const listed = await api(two.url!, '/api/configurations', token.engineer)
    const text = JSON.stringify(listed.body)
    for (const id of acknowledged) expect(text).toContain(`"id":${id}`)
  })
})
