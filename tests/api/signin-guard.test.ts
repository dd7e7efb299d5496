/**
 * Issue 11, findings 2 and 3: sign-in and sign-up are limited per client address whatever
 * e-mail is typed, and wrong passwords delay only the address they came from, with growing
 * delays; an admin can unlock an account (audited). Addresses are set with X-Forwarded-For,
 * which the app trusts from loopback (one proxy hop), so each test speaks from its own address.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { delayAfter, MemorySigninFailureStore, SigninGuard } from '../../api/services/signin-guard'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
beforeAll(async () => {
  t = await startTestApp({
    config: {
      signinLockout: { failures: 3, baseDelayMs: 60_000, lockMs: 15 * 60_000 },
      signinRateLimit: { windowMs: 60_000, limit: 6 },
      signupRateLimit: { windowMs: 60_000, limit: 3 },
    },
  })
})
afterAll(() => t.close())

const signin = (from: string, email: string, password: string) =>
  request(t.app).post('/api/auth/signin').set('X-Forwarded-For', from).send({ email, password })

describe('the sign-in limit per client address', () => {
  it('limits made-up e-mails from one address like real ones (429 with Retry-After), and not other addresses', async () => {
    // the old limit keyed on address *and* e-mail, so a new e-mail each time was never limited
    for (let i = 0; i < 6; i++) expect((await signin('10.1.0.1', `made.up.${i}@example.test`, 'whatever it is')).status).toBe(401)
    const blocked = await signin('10.1.0.1', 'yet.another@example.test', 'whatever it is')
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.code).toBe('rate_limited')
    expect(blocked.body.error.message).toMatch(/too many failed sign-in attempts from your address/)
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0)
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(60)
    expect((await signin('10.1.0.2', demoEmail('engineer'), 'flexshelf-demo')).status).toBe(200)
  })
})

describe('growing delays per account and address', () => {
  const account = { email: 'delay.me@example.test', password: 'the right password', displayName: 'Dell Amey' }
  beforeAll(async () => {
    await request(t.app).post('/api/auth/signup').set('X-Forwarded-For', '10.2.0.99').send(account).expect(201)
  })

  it('delays the address that guessed, with Retry-After, even for the right password', async () => {
    for (let i = 0; i < 3; i++) expect((await signin('10.2.0.1', account.email, `wrong ${i}`)).status).toBe(401)
    const delayed = await signin('10.2.0.1', account.email.toUpperCase(), account.password)
    expect(delayed.status).toBe(429)
    expect(delayed.body.error.message).toMatch(/too many wrong passwords for this account from your address; try again in 60 seconds/)
    expect(Number(delayed.headers['retry-after'])).toBe(60)
  })

  it('never blocks the right password from another address (the owner cannot be locked out)', async () => {
    // the old lockout keyed on the e-mail alone: five wrong passwords from anywhere locked the owner out
    const res = await signin('10.2.0.2', account.email, account.password)
    expect(res.status).toBe(200)
  })

  it('counts an unknown e-mail the same way, so answers do not tell which accounts exist', async () => {
    for (let i = 0; i < 3; i++) expect((await signin('10.2.0.3', 'nobody.there@example.test', `guess ${i}`)).status).toBe(401)
    expect((await signin('10.2.0.3', 'nobody.there@example.test', 'guess 4')).status).toBe(429)
  })

  it('does not count malformed requests as guesses', async () => {
    for (let i = 0; i < 5; i++) {
      const res = await request(t.app).post('/api/auth/signin').set('X-Forwarded-For', '10.2.0.4').send({ email: demoEmail('librarian'), password: '' })
      expect(res.status).toBe(400)
    }
    expect((await signin('10.2.0.4', demoEmail('librarian'), 'flexshelf-demo')).status).toBe(200)
  })
})

describe('POST /api/users/:id/unlock', () => {
  it('lets an admin clear the delays of an account, recorded in the audit log', async () => {
    const email = demoEmail('contributor')
    for (let i = 0; i < 3; i++) expect((await signin('10.3.0.1', email, `wrong ${i}`)).status).toBe(401)
    expect((await signin('10.3.0.1', email, 'flexshelf-demo')).status).toBe(429)
    const admin = await signInAs(t.app, 'admin')
    const user = await t.context.db.models.User.findOne({ where: { email } })
    const res = await request(t.app).post(`/api/users/${user!.id}/unlock`).set(bearer(admin))
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ user: expect.objectContaining({ id: user!.id, email }), cleared: 1 })
    expect((await signin('10.3.0.1', email, 'flexshelf-demo')).status).toBe(200)
    const audit = await t.context.db.models.AuditEvent.findOne({ where: { action: 'user.unlock', subjectId: String(user!.id) } })
    expect(audit?.details).toMatchObject({ email, cleared: 1, via: 'api' })
  })

  it('is for admins only, and answers 404 for an unknown user', async () => {
    const librarian = await signInAs(t.app, 'librarian')
    expect((await request(t.app).post('/api/users/1/unlock').set(bearer(librarian))).status).toBe(403)
    const admin = await signInAs(t.app, 'admin')
    expect((await request(t.app).post('/api/users/999999/unlock').set(bearer(admin))).status).toBe(404)
  })
})

describe('the sign-up limit per client address', () => {
  it('answers 429 with Retry-After after the limit, whatever the e-mails, and not to other addresses', async () => {
    const signup = (from: string, i: number) => request(t.app).post('/api/auth/signup').set('X-Forwarded-For', from)
      .send({ email: `new.person.${from}.${i}@example.test`, password: 'a long enough password', displayName: `Person ${i}` })
    for (let i = 0; i < 3; i++) expect((await signup('10.4.0.1', i)).status).toBe(201)
    const blocked = await signup('10.4.0.1', 3)
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.message).toMatch(/too many sign-ups from your address/)
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0)
    expect((await signup('10.4.0.2', 0)).status).toBe(201)
  })
})

describe('SigninGuard over time', () => {
  it('doubles the delay after each further failure up to the cap, and forgets on success', async () => {
    let now = 1_000_000
    const settings = { failures: 5, baseDelayMs: 30_000, lockMs: 15 * 60_000 }
    const guard = new SigninGuard(settings, new MemorySigninFailureStore(), () => now)
    expect([4, 5, 6, 7, 10, 50].map((n) => delayAfter(settings, n))).toEqual([0, 30_000, 60_000, 120_000, 900_000, 900_000])
    for (let i = 0; i < 5; i++) await guard.failed('a@example.test', '10.0.0.1')
    expect(await guard.waitFor('a@example.test', '10.0.0.1')).toBe(30_000)
    expect(await guard.waitFor('a@example.test', '10.0.0.2')).toBe(0)
    now += 30_000
    expect(await guard.waitFor('a@example.test', '10.0.0.1')).toBe(0)
    await guard.failed('a@example.test', '10.0.0.1')
    expect(await guard.waitFor('a@example.test', '10.0.0.1')).toBe(60_000)
    await expect(guard.assertAllowed('a@example.test', '10.0.0.1')).rejects.toThrow(/try again in 60 seconds/)
    await guard.succeeded('a@example.test', '10.0.0.1')
    expect(await guard.waitFor('a@example.test', '10.0.0.1')).toBe(0)
  })
})
