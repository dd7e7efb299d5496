/**
 * POST /api/families/:id/evaluate under fuzzed bodies (fast-check): every answer is 200,
 * 400 or 422 (404 for a family that does not exist), never 500, and every refusal carries the
 * error shape of docs/api.md with the bad fields named. 1000 requests; two in ten bodies are
 * inside the schema (a quarter of those with the nonlinear solver), the rest are refused
 * before any model runs.
 */
import fc from 'fast-check'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { families } from '../../catalog'
import { paramCases } from '../catalog/fuzz/arbitraries'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

const RUNS = 1000

let t: TestApp
let token: string

beforeAll(async () => {
  t = await startTestApp()
  token = await signInAs(t.app, 'engineer')
})
afterAll(() => t.close())

type Body = { kind: 'json'; familyId: string; body: unknown } | { kind: 'raw'; familyId: string; text: string }

const methodOf = (familyId: string) => {
  const family = families.find((f) => f.id === familyId)!
  return fc.oneof(
    { weight: 6, arbitrary: fc.constant(undefined) },
    { weight: 3, arbitrary: fc.constantFrom(...family.methods.map((m) => m.id)) },
    { weight: 1, arbitrary: fc.oneof(fc.string({ maxLength: 80 }), fc.integer(), fc.constant(null)) },
  )
}

const jsonBody: fc.Arbitrary<Body> = fc.constantFrom(...families).chain((family) =>
  fc.tuple(paramCases(family, { validWeight: 2 }), methodOf(family.id), fc.option(fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue(), { maxKeys: 2 }), { freq: 8 }))
    .map(([c, method, extra]): Body => {
      const body: Record<string, unknown> = { ...(extra ?? {}), params: c.params }
      if (method !== undefined) body.method = method
      // JSON cannot carry NaN or Infinity: JSON.stringify turns them into null, as a browser would
      return { kind: 'json', familyId: family.id, body: JSON.parse(JSON.stringify(body)) }
    }))

const rawBody: fc.Arbitrary<Body> = fc.tuple(
  fc.constantFrom(...families.map((f) => f.id)),
  fc.oneof(
    fc.string({ maxLength: 60 }),
    fc.jsonValue().map((v) => JSON.stringify(v) ?? 'null'),
    fc.nat({ max: 4000 }).map((depth) => '['.repeat(depth) + ']'.repeat(depth)),
    fc.constantFrom('{"params":', '{"params":{"span":1e999}}', '{"params":{"span":-0}}', '{"__proto__":{"method":"nonlinear-fe"}}', '{"params":{"__proto__":{"span":5}}}'),
  ),
).map(([familyId, text]): Body => ({ kind: 'raw', familyId, text }))

const unknownFamily: fc.Arbitrary<Body> = fc.string({ minLength: 1, maxLength: 20 })
  .filter((id) => !families.some((f) => f.id === id) && !/[/?#%\\]/.test(id) && id.trim() === id && id !== '.' && id !== '..')
  .map((familyId): Body => ({ kind: 'json', familyId, body: { params: {} } }))

describe('POST /api/families/:id/evaluate', () => {
  describe('with fuzzed bodies', () => {
    it(`answers 200, 400, 422 or 404, never 500, over ${RUNS} requests`, async () => {
      const seen: Record<number, number> = {}
      await fc.assert(
        fc.asyncProperty(fc.oneof({ weight: 7, arbitrary: jsonBody }, { weight: 2, arbitrary: rawBody }, { weight: 1, arbitrary: unknownFamily }), async (b) => {
          const req = request(t.app).post(`/api/families/${encodeURIComponent(b.familyId)}/evaluate`).set(bearer(token))
          const res = b.kind === 'json' ? await req.send(b.body as object) : await req.set('Content-Type', 'application/json').send(b.text)
          seen[res.status] = (seen[res.status] ?? 0) + 1
          expect([200, 400, 404, 422], JSON.stringify(res.body)).toContain(res.status)
          if (res.status === 200) {
            for (const v of [...res.body.curve.displacement, ...res.body.curve.force]) expect(typeof v).toBe('number')
            return
          }
          expect(typeof res.body.error.code).toBe('string')
          expect(res.body.error.message.length).toBeGreaterThan(0)
          if (res.body.error.code === 'validation_failed') {
            expect(res.body.error.details.issues.length).toBeGreaterThan(0)
            // the field as sent (an empty key is a field named ""), always with a message
            for (const issue of res.body.error.details.issues) {
              expect(typeof issue.field).toBe('string')
              expect(issue.message.length).toBeGreaterThan(issue.field.length)
            }
          }
        }),
        { numRuns: RUNS, seed: 8_2030 },
      )
      console.log('evaluate fuzz statuses:', JSON.stringify(seen))
      expect(t.logged).toEqual([])
      expect(seen[200]).toBeGreaterThan(50)
      expect(seen[400]).toBeGreaterThan(300)
    }, 180_000)
  })
})
