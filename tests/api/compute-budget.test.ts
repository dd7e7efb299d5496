/**
 * Issue 11: the compute budget and the password pool. A task past its budget has its worker
 * stopped and the request answers 422 compute_budget_exceeded naming what was asked; the pool
 * starts a fresh thread and the next request is answered normally. Password hashing runs on a
 * pool of its own, so a burst of sign-ins no longer queues in front of evaluations (finding 2).
 * The assertions are about order and answers, never about wall-clock speed.
 */
import bcrypt from 'bcryptjs'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { compute, ComputeBudgetExceededError, configureComputePool } from '../../api/services/compute-pool'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let engineer: string
let switchId: number

beforeAll(async () => {
  t = await startTestApp()
  engineer = await signInAs(t.app, 'engineer')
  switchId = (await t.context.db.models.Entry.findOne({ where: { name: 'Power switch, field node shell S1' } }))!.id
  await configureComputePool({ threads: 1, budgetMs: 10_000 })
  // warm the thread (tsx and the catalog load on first use)
  await compute.evaluate('notch-hinge', {})
})
afterAll(async () => {
  await configureComputePool({ threads: 0, budgetMs: 10_000 })
  await t.close()
})

describe('a task past the compute budget', () => {
  it('answers 422 compute_budget_exceeded naming the check asked for, then the pool answers again', async () => {
    // five nonlinear solves of the bistable beam take far longer than 2 ms on any machine
    await configureComputePool({ threads: 1, budgetMs: 2 })
    await compute.evaluate('notch-hinge', {}).catch(() => undefined)
    const res = await request(t.app).post(`/api/entries/${switchId}/check`).set(bearer(engineer)).send({ method: 'nonlinear-fe' })
    expect(res.status).toBe(422)
    expect(res.body.error.code).toBe('compute_budget_exceeded')
    expect(res.body.error.message).toMatch(new RegExp(`^the check of entry ${switchId} "Power switch, field node shell S1" \\(bistable-beam, method nonlinear-fe\\) took longer than the compute budget of 2 ms`))
    expect(res.body.error.details).toEqual({ task: 'check', familyId: 'bistable-beam', budgetMs: 2 })
    expect(t.logged).toEqual([])

    await configureComputePool({ threads: 1, budgetMs: 10_000 })
    const again = await request(t.app).post(`/api/entries/${switchId}/check`).set(bearer(engineer)).send({ method: 'nonlinear-fe' })
    expect(again.status).toBe(200)
    expect(again.body.evaluation.curve.force.length).toBeGreaterThan(10)
  })

  it('gives the service call a ComputeBudgetExceededError naming the band', async () => {
    await configureComputePool({ threads: 1, budgetMs: 2 })
    const err = await compute.toleranceBand('bistable-beam', {}, { method: 'nonlinear-fe' }).catch((e: unknown) => e)
    expect(err).toBeInstanceOf(ComputeBudgetExceededError)
    expect((err as Error).message).toMatch(/^the tolerance band of bistable-beam \(method nonlinear-fe\) took longer/)
  })
})

describe('GET /api/health while checks run', () => {
  it('answers before a burst of checks has finished', async () => {
    await configureComputePool({ threads: 1, budgetMs: 10_000 })
    const order: string[] = []
    const checks = Array.from({ length: 6 }, () =>
      request(t.app).post(`/api/entries/${switchId}/check`).set(bearer(engineer)).send({ method: 'nonlinear-fe' }).then((r) => { order.push('check'); return r }))
    await new Promise((r) => setTimeout(r, 20))
    const health = await request(t.app).get('/api/health')
    order.push('health')
    expect(health.status).toBe(200)
    const results = await Promise.all(checks)
    expect(results.map((r) => r.status)).toEqual([200, 200, 200, 200, 200, 200])
    expect(order.indexOf('health')).toBeLessThan(order.length - 1)
  })
})

describe('password hashing on its own pool', () => {
  it('lets an evaluation finish before a burst of sign-in hashes queued ahead of it', async () => {
    await configureComputePool({ threads: 1, budgetMs: 10_000 })
    const hash = bcrypt.hashSync('a password of someone', 10)
    const order: string[] = []
    const compares = Array.from({ length: 16 }, () => compute.comparePassword('a wrong guess here', hash).then(() => order.push('bcrypt')))
    const evaluation = compute.evaluate('leaf-hinge', { length: 8 }).then(() => order.push('evaluate'))
    await Promise.all([...compares, evaluation])
    // on one shared thread the evaluation waited behind all sixteen hashes
    expect(order.indexOf('evaluate')).toBeLessThan(order.length - 1)
  })
})
