/**
 * Search through HTTP: the shelf export, one-shot search, search jobs with server-sent
 * progress, cancellation and the answer cache. The engine itself is tested in
 * tests/catalog/search; here the API must give the engine's answer over the database shelf.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { searchShelfSync, type SearchAnswer, type ShelfEntry } from '../../catalog'
import { configureComputePool } from '../../api/services/compute-pool'
import { MAX_TRADEOFF_POINTS, searchService, tradeoffsOf, type Tradeoffs } from '../../api/services/search'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'
import { readEvents } from './sse'

let t: TestApp
let engineer: string
let contributor: string
let switchEntry: ShelfEntry
/** A window around the power switch's default configuration, evaluated directly. */
let aroundSwitch: Record<string, unknown>

beforeAll(async () => {
  t = await startTestApp()
  engineer = await signInAs(t.app, 'engineer')
  contributor = await signInAs(t.app, 'contributor')
  const shelf = await request(t.app).get('/api/shelf').set(bearer(engineer)).expect(200)
  switchEntry = shelf.body.entries.find((e: ShelfEntry) => e.name === 'Power switch, field node shell S1')
  const evaluation = await request(t.app).post('/api/families/bistable-beam/evaluate').set(bearer(engineer))
    .send({ params: { ...switchEntry.defaultParams, material: 'petg' } }).expect(200)
  const peak = evaluation.body.metrics.peakForce as number
  const holding = -(evaluation.body.metrics.valleyForce as number)
  aroundSwitch = { kind: 'bistable', peakForce: { min: 0.7 * peak, max: 1.3 * peak }, holdingForce: { min: 0.5 * holding }, materials: ['petg'] }
})
afterAll(() => t.close())

const sameAnswer = (observed: SearchAnswer, expected: SearchAnswer) => {
  // the API adds the scatter's points (checked in their own test) to the engine's answer
  const strip = (a: SearchAnswer) => ({ ...a, elapsedMs: 0, tradeoffs: undefined })
  expect(strip(observed)).toEqual(strip(expected))
}

describe('GET /api/shelf', () => {
  it('lists released entries in the shape the command line reads, without drafts', async () => {
    const res = await request(t.app).get('/api/shelf').set(bearer(engineer)).expect(200)
    const entries = res.body.entries as ShelfEntry[]
    expect(entries.length).toBeGreaterThan(3)
    for (const e of entries) {
      expect(Object.keys(e).sort()).toEqual(['defaultParams', 'familyId', 'id', 'materials', 'name', 'ranges', 'status', 'summary', 'tags'])
      expect(e.status).toBe('released')
    }
    const drafts = await t.context.db.models.Entry.count({ where: { status: 'draft' } })
    expect(drafts).toBeGreaterThan(0)
  })
})

describe('POST /api/search', () => {
  describe('with a window around a demo entry’s own configuration', () => {
    it('answers 200 with that entry among the results, every band inside the window', async () => {
      const res = await request(t.app).post('/api/search').set(bearer(engineer)).send(aroundSwitch).expect(200)
      const answer = res.body as SearchAnswer
      expect(answer.results.map((r) => r.entryId)).toContain(switchEntry.id)
      const peak = aroundSwitch.peakForce as { min: number; max: number }
      for (const r of answer.results) {
        const [low, high] = r.band.peakForce!
        expect(low).toBeGreaterThanOrEqual(peak.min)
        expect(high).toBeLessThanOrEqual(peak.max)
        expect(r.params.material).toBe('petg')
      }
      expect(answer.explanation).toMatch(/configuration/)
    })

    it('gives exactly what the engine gives over the exported shelf and curated materials', async () => {
      const window = { ...aroundSwitch, text: 'switch' }
      const res = await request(t.app).post('/api/search').set(bearer(engineer)).send(window).expect(200)
      const shelf = (await request(t.app).get('/api/shelf').set(bearer(engineer))).body.entries as ShelfEntry[]
      const materials = (await request(t.app).get('/api/materials').set(bearer(engineer))).body.materials
      sameAnswer(res.body, searchShelfSync(window, shelf, { materials }))
    })
  })

  describe('the trade-off points beside the answer', () => {
    it('hold every listed result and every close variant once, with its margin, strain safety and footprint', async () => {
      const res = await request(t.app).post('/api/search').set(bearer(engineer)).send({ ...aroundSwitch, materials: ['petg', 'abs', 'pa12'] }).expect(200)
      const answer = res.body as SearchAnswer & { tradeoffs: Tradeoffs }
      const { points, total, capped } = answer.tradeoffs
      const variants = answer.results.reduce((n, r) => n + (r.closeVariants?.length ?? 0), 0)
      expect(variants).toBeGreaterThan(0)
      expect(total).toBe(answer.results.length + variants)
      expect(capped).toBe(total > MAX_TRADEOFF_POINTS)
      answer.results.forEach((r, i) => {
        const p = points.find((q) => q.position === i + 1)!
        expect({ margin: p.margin, safetyFactor: p.safetyFactor, params: p.params, footprint: p.footprint }).toEqual({ margin: r.margin, safetyFactor: r.safetyFactor, params: r.params, footprint: r.rank!.footprint })
      })
      for (const p of points.filter((q) => q.position === null)) {
        const lead = answer.results[p.variantOf! - 1]
        expect(lead.closeVariants!.some((v) => v.margin === p.margin && JSON.stringify(v.params) === JSON.stringify(p.params))).toBe(true)
        // a bistable beam's plan envelope: the span (plus its side posts) by the frame; at least span × apex height
        const span = p.params.span as number
        expect(p.footprint!).toBeGreaterThan(span * (p.params.apexHeight as number))
      }
    })

    it('cap the points, keeping every listed result first, and say so', () => {
      const result = (margin: number, variants: number[]) => ({
        entryId: 1, entryName: 'x', family: 'bistable-beam', params: { span: 60, apexHeight: 2, thickness: 0.7, depth: 6, postLength: 0, material: 'petg' },
        margin, safetyFactor: 2, closeVariants: variants.map((m) => ({ params: { span: 60.5, apexHeight: 2, thickness: 0.7, depth: 6, postLength: 0, material: 'petg' }, margin: m, safetyFactor: 2 })),
      })
      const answer = { results: [result(0.3, [0.1, 0.25]), result(0.2, [0.05, 0.28])] } as unknown as SearchAnswer
      const out = tradeoffsOf(answer, 4)
      expect(out).toMatchObject({ total: 6, capped: true })
      expect(out.points.map((p) => [p.position, p.margin])).toEqual([[1, 0.3], [2, 0.2], [null, 0.28], [null, 0.25]])
      expect(out.points[2].variantOf).toBe(2)
      expect(tradeoffsOf(answer).capped).toBe(false)
    })
  })

  describe('with a window no module can meet', () => {
    it('answers 200 with no results and an explanation naming what ruled candidates out', async () => {
      const res = await request(t.app).post('/api/search').set(bearer(engineer)).send({ kind: 'bistable', peakForce: { min: 900, max: 1000 } }).expect(200)
      expect(res.body.results).toEqual([])
      expect(res.body.explanation).toMatch(/peak force/i)
      expect(res.body.explanation).toMatch(/nearest/i)
    })
  })

  describe('with an invalid window', () => {
    const cases: Array<[string, unknown, string]> = [
      ['min above max', { kind: 'bistable', peakForce: { min: 5, max: 3 } }, 'peakForce.min'],
      ['a negative force', { kind: 'spring', stiffness: { min: -1 } }, 'stiffness.min'],
      ['an unknown material', { kind: 'hinge', rotation: { min: 10 }, materials: ['unobtainium'] }, 'materials.0'],
      ['no kind', { peakForce: { min: 1 } }, 'kind'],
      ['a quantity of another kind', { kind: 'spring', peakForce: { min: 1 } }, 'peakForce'],
    ]
    for (const [name, body, field] of cases) {
      it(`answers 400 naming ${field} for ${name}`, async () => {
        const res = await request(t.app).post('/api/search').set(bearer(engineer)).send(body as object).expect(400)
        expect(res.body.error.code).toBe('validation_failed')
        expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toContain(field)
      })
    }

    it('knows the curated materials, not only the built-in ones', async () => {
      await t.context.db.models.Material.create({ id: 'petg-cf', name: 'PETG-CF (FDM)', process: 'FDM', modulus: 3800, poissonRatio: 0.38, poissonRatioSource: 'test material', strainLimit: 0.012, density: 1.3, notes: '', source: 'test material' })
      const res = await request(t.app).post('/api/search').set(bearer(engineer)).send({ kind: 'bistable', peakForce: { min: 1 }, materials: ['petg-cf'] })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      await t.context.db.models.Material.destroy({ where: { id: 'petg-cf' } })
    })
  })

  describe('the same window twice', () => {
    it('answers the second time from the cache, with the same answer', async () => {
      const window = { kind: 'spring', stiffness: { min: 0.2, max: 0.6 }, limit: 7 }
      const first = await request(t.app).post('/api/search').set(bearer(engineer)).send(window).expect(200)
      // keys in another order and a default spelled out are the same window
      const second = await request(t.app).post('/api/search').set(bearer(contributor)).send({ limit: 7, stiffness: { max: 0.6, min: 0.2 }, kind: 'spring' }).expect(200)
      expect(first.headers['flexshelf-cache']).toBe('miss')
      expect(second.headers['flexshelf-cache']).toBe('hit')
      expect(second.body).toEqual(first.body)
    })

    it('computes again once an entry changes status', async () => {
      const window = { kind: 'bistable', peakForce: { min: 1, max: 12 }, limit: 30 }
      const before = await request(t.app).post('/api/search').set(bearer(engineer)).send(window).expect(200)
      expect(before.body.results.map((r: { entryId: number }) => r.entryId)).toContain(switchEntry.id)
      await t.context.db.models.Entry.update({ status: 'retired' }, { where: { id: switchEntry.id } })
      const after = await request(t.app).post('/api/search').set(bearer(engineer)).send(window).expect(200)
      await t.context.db.models.Entry.update({ status: 'released' }, { where: { id: switchEntry.id } })
      expect(after.headers['flexshelf-cache']).toBe('miss')
      expect(after.body.results.map((r: { entryId: number }) => r.entryId)).not.toContain(switchEntry.id)
    })
  })
})

describe('POST /api/searches and GET /api/searches/:id/events', () => {
  it('streams progress, then the result, then ends', async () => {
    const window = { ...aroundSwitch, limit: 5 }
    const started = await request(t.app).post('/api/searches').set(bearer(engineer)).send(window).expect(202)
    expect(started.body.status).toBe('running')
    const res = await request(t.app).get(`/api/searches/${started.body.id}/events`).set(bearer(engineer)).buffer(true).parse(readEvents).expect(200)
    expect(res.headers['content-type']).toMatch(/^text\/event-stream/)
    const events = res.body as Array<{ event: string; data: any }>
    const names = events.map((e) => e.event)
    expect(names[0]).toBe('progress')
    expect(names.at(-1)).toBe('result')
    expect(names.filter((n) => n !== 'progress')).toEqual(['result'])
    const progress = events.filter((e) => e.event === 'progress').map((e) => e.data)
    for (const p of progress) expect(p.done).toBeLessThanOrEqual(p.total)
    const result = events.at(-1)!.data
    expect(result.results.length).toBeGreaterThan(0)
    expect(result.results.length).toBeLessThanOrEqual(5)
     // GET /api/searches/:id afterwards: the ended job's state with the same result
    const state = await request(t.app).get(`/api/searches/${started.body.id}`).set(bearer(engineer))
    expect(state.status, JSON.stringify(state.body)).toBe(200)
    expect(state.body).toMatchObject({ id: started.body.id, status: 'done', cached: false, error: null, progress: { phase: 'done' } })
    expect(state.body.result).toEqual(result)
  })

  it('replays a finished job’s result to a late follower, and answers a repeated window from the cache', async () => {
    const window = { kind: 'hinge', rotationalStiffness: { min: 1, max: 400 }, limit: 4 }
    const first = await request(t.app).post('/api/searches').set(bearer(engineer)).send(window).expect(202)
    const one = await request(t.app).get(`/api/searches/${first.body.id}/events`).set(bearer(engineer)).buffer(true).parse(readEvents)
    const again = await request(t.app).post('/api/searches').set(bearer(engineer)).send(window).expect(202)
    expect(again.body).toMatchObject({ status: 'done', cached: true })
    const two = await request(t.app).get(`/api/searches/${again.body.id}/events`).set(bearer(engineer)).buffer(true).parse(readEvents)
    const last = (r: { body: Array<{ event: string; data: any }> }) => r.body.at(-1)!
    expect(last(two).event).toBe('result')
    expect(last(two).data.cached).toBe(true)
    expect({ ...last(two).data, cached: false }).toEqual(last(one).data)
  })

  it('answers 404 to another user following or cancelling the job', async () => {
    const started = await request(t.app).post('/api/searches').set(bearer(engineer)).send({ kind: 'latch', matingForce: { max: 30 } }).expect(202)
    await request(t.app).get(`/api/searches/${started.body.id}/events`).set(bearer(contributor)).expect(404)
    await request(t.app).get(`/api/searches/${started.body.id}`).set(bearer(contributor)).expect(404)
    await request(t.app).delete(`/api/searches/${started.body.id}`).set(bearer(contributor)).expect(404)
    await request(t.app).get('/api/searches/no-such-job/events').set(bearer(engineer)).expect(404)
  })

  it('answers 400 naming the field before any job starts', async () => {
    const res = await request(t.app).post('/api/searches').set(bearer(engineer)).send({ kind: 'guide', travel: { min: 4, max: 2 } }).expect(400)
    expect(res.body.error.details.issues[0].field).toBe('travel.min')
  })
})

describe('DELETE /api/searches/:id', () => {
  let big: TestApp
  let token: string

  beforeAll(async () => {
    // a long search: 200 released copies of the demo bistable entries
    big = await startTestApp()
    const { Entry } = big.context.db.models
    const seeds = await Entry.findAll({ where: { status: 'released', familyId: 'bistable-beam' } })
    const copies = Array.from({ length: 200 }, (_, i) => {
      const s = seeds[i % seeds.length]
      return { familyId: s.familyId, name: `${s.name} copy ${i}`, summary: s.summary, tags: s.tags, status: 'released' as const, defaultParams: s.defaultParams, ranges: s.ranges, materials: s.materials, notes: '', ownerId: s.ownerId, currentRevisionId: null }
    })
    await Entry.bulkCreate(copies)
    token = await signInAs(big.app, 'engineer')
  })
  afterAll(() => big.close())

  it('cancels a running search: 204, its followers get "cancelled", the thread is free again', async () => {
    const window = { kind: 'bistable', peakForce: { min: 2, max: 9 } }
    const started = await request(big.app).post('/api/searches').set(bearer(token)).send(window).expect(202)
    const following = request(big.app).get(`/api/searches/${started.body.id}/events`).set(bearer(token)).buffer(true).parse(readEvents)
    await new Promise((r) => setTimeout(r, 150))
    await request(big.app).delete(`/api/searches/${started.body.id}`).set(bearer(token)).expect(204)
    const events = (await following).body as Array<{ event: string }>
    expect(events.at(-1)!.event).toBe('cancelled')
    expect(events.some((e) => e.event === 'result')).toBe(false)
    // the cancelled job is still there for followers; deleting it again forgets it
    await request(big.app).delete(`/api/searches/${started.body.id}`).set(bearer(token)).expect(204)
    await request(big.app).get(`/api/searches/${started.body.id}/events`).set(bearer(token)).expect(404)
    // and nothing half-done was cached
    expect(searchService(big.context).stats.hits).toBe(0)
    const small = await request(big.app).post('/api/search').set(bearer(token)).send({ kind: 'spring', stiffness: { min: 0.1 }, limit: 2 }).expect(200)
    expect(small.headers['flexshelf-cache']).toBe('miss')
  })

  it('lets one user run at most three searches at once', async () => {
    const window = (i: number) => ({ kind: 'bistable', peakForce: { min: 2, max: 9 + i } })
    const ids: string[] = []
    for (let i = 0; i < 3; i++) ids.push((await request(big.app).post('/api/searches').set(bearer(token)).send(window(i)).expect(202)).body.id)
    const fourth = await request(big.app).post('/api/searches').set(bearer(token)).send(window(3)).expect(429)
    expect(fourth.body.error.message).toMatch(/3 searches running/)
    for (const id of ids) await request(big.app).delete(`/api/searches/${id}`).set(bearer(token)).expect(204)
  })

  it('counts POST /api/search under the same per-user limit (issue 11, finding 5)', async () => {
    const window = (i: number) => ({ kind: 'bistable', peakForce: { min: 3, max: 9 + i } })
    const ids: string[] = []
    for (let i = 0; i < 3; i++) ids.push((await request(big.app).post('/api/searches').set(bearer(token)).send(window(i)).expect(202)).body.id)
    // the old limit covered /api/searches only: this one-shot search ran as a fourth
    const oneShot = await request(big.app).post('/api/search').set(bearer(token)).send(window(3)).expect(429)
    expect(oneShot.body.error.message).toMatch(/3 searches running/)
    expect(oneShot.headers['retry-after']).toBe('1')
    // another user is not held back by this one's searches
    const other = await signInAs(big.app, 'librarian')
    await request(big.app).post('/api/search').set(bearer(other)).send({ kind: 'spring', stiffness: { min: 0.2 }, limit: 1 }).expect(200)
    for (const id of ids) await request(big.app).delete(`/api/searches/${id}`).set(bearer(token)).expect(204)
  })

  it('stops a search past the compute budget: 422 compute_budget_exceeded naming the search, and the next one runs', async () => {
    await configureComputePool({ threads: 0, budgetMs: 1 })
    try {
      const res = await request(big.app).post('/api/search').set(bearer(token)).send({ kind: 'bistable', peakForce: { min: 2.5, max: 8 } }).expect(422)
      expect(res.body.error).toMatchObject({ code: 'compute_budget_exceeded', details: { task: 'search', budgetMs: 1 } })
      expect(res.body.error.message).toMatch(/^the search for a bistable window took longer than the compute budget of 1 ms/)
    } finally {
      // the next search runs under a budget generous enough for a busy 2-core machine
      // (the 200-entry shelf with its exact confirmations), then the default comes back
      await configureComputePool({ threads: 0, budgetMs: 50_000 })
    }
    try {
      await request(big.app).post('/api/search').set(bearer(token)).send({ kind: 'bistable', peakForce: { min: 2.5, max: 8 } }).expect(200)
    } finally {
      await configureComputePool({ threads: 0, budgetMs: 10_000 })
    }
  })
})
