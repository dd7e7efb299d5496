/**
 * The password life cycle and who may sign up: strength rules, change (other sessions end),
 * reset by e-mail (a single-use hashed token valid 30 minutes), FLEXSHELF_SIGNUP(_DOMAINS)
 * and password sign-in switched off.
 */
import { createHash } from 'node:crypto'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, signIn, startTestApp, type TestApp } from './helpers'

const GOOD = 'quiet lantern meadow 42'
const GOOD_2 = 'copper kestrel window 17'

async function newUser(t: TestApp, email: string, password = GOOD): Promise<string> {
  const res = await request(t.app).post('/api/auth/signup').send({ email, password, displayName: 'Orla Penhallow' })
  expect(res.status).toBe(201)
  return res.body.token as string
}

/** The reset e-mail is sent after the 202 answer; wait for it in the outbox (bounded). */
async function resetMailFor(t: TestApp, email: string, after = 0): Promise<string> {
  for (let i = 0; i < 100; i++) {
    const messages = await t.context.db.models.OutboxMessage.findAll({ order: [['id', 'DESC']] })
    const mail = messages.find((m) => m.id > after && m.to.includes(email) && m.subject.includes('reset your password'))
    if (mail) return mail.text
    await new Promise((r) => setTimeout(r, 20))
  }
  throw new Error(`no reset e-mail for ${email}`)
}
const tokenOf = (mail: string) => /\/reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail)![1]

let t: TestApp
beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())

describe('password strength (sign-up)', () => {
  // each of these passes a plain length rule; the estimator (zxcvbn, Wheeler 2016) rates them 0–1
  for (const weak of ['111111111111', '            ', 'password1234', 'qwertyuiopasdf', 'abcdefghijklmnop']) {
    it(`refuses ${JSON.stringify(weak)}, naming the rule`, async () => {
      const res = await request(t.app).post('/api/auth/signup').send({ email: 'weak@example.test', password: weak, displayName: 'Wen Ashby' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'password', message: expect.stringMatching(/^password is too easy to guess \(rated [01] of 4 .*at least 3 needed\)/) }])
    })
  }

  it('refuses a password made of the person\'s own name and e-mail', async () => {
    const res = await request(t.app).post('/api/auth/signup').send({ email: 'wendeline.ashby@example.test', password: 'wendelineashby', displayName: 'Wendeline Ashby' })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/too easy to guess/)
  })

  it('accepts four unrelated words', async () => {
    await newUser(t, 'strong@example.test')
  })
})

describe('POST /api/auth/password', () => {
  describe('with the right current password and a strong new one', () => {
    it('answers 204; this session carries on, every other one ends, the new password signs in', async () => {
      await newUser(t, 'changer@example.test')
      const here = await signIn(t.app, 'changer@example.test', GOOD)
      const elsewhere = await signIn(t.app, 'changer@example.test', GOOD)
      const res = await request(t.app).post('/api/auth/password').set(bearer(here)).send({ currentPassword: GOOD, newPassword: GOOD_2 })
      expect(res.status).toBe(204)
      expect((await request(t.app).get('/api/auth/me').set(bearer(here))).status).toBe(200)
      const other = await request(t.app).get('/api/auth/me').set(bearer(elsewhere))
      expect(other.status).toBe(401)
      expect(other.body.error.message).toContain('password has changed')
      expect((await request(t.app).post('/api/auth/signin').send({ email: 'changer@example.test', password: GOOD })).status).toBe(401)
      await signIn(t.app, 'changer@example.test', GOOD_2)
    })

    it('is audited and the owner is told by e-mail', async () => {
      const user = await t.context.db.models.User.findOne({ where: { email: 'changer@example.test' } })
      const event = await t.context.db.models.AuditEvent.findOne({ where: { action: 'user.password_changed', subjectId: String(user!.id) } })
      expect(event).not.toBeNull()
      const mail = await t.context.db.models.OutboxMessage.findOne({ where: { subject: 'Flexshelf: your password was changed' } })
      expect(mail!.to).toEqual(['changer@example.test'])
    })
  })

  describe('with a wrong current password', () => {
    it('answers 400 naming currentPassword and changes nothing', async () => {
      const token = await newUser(t, 'wrong.current@example.test')
      const res = await request(t.app).post('/api/auth/password').set(bearer(token)).send({ currentPassword: 'not it at all', newPassword: GOOD_2 })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'currentPassword', message: 'currentPassword is not your current password' }])
      await signIn(t.app, 'wrong.current@example.test', GOOD)
    })
  })

  describe('with a weak new password', () => {
    it('answers 400 naming newPassword and the rule', async () => {
      const token = await newUser(t, 'weak.new@example.test')
      const res = await request(t.app).post('/api/auth/password').set(bearer(token)).send({ currentPassword: GOOD, newPassword: 'aaaaaaaaaaaa' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues[0]).toMatchObject({ field: 'newPassword', message: expect.stringContaining('too easy to guess') })
      const short = await request(t.app).post('/api/auth/password').set(bearer(token)).send({ currentPassword: GOOD, newPassword: 'Xy7#' })
      expect(short.body.error.details.issues).toEqual([{ field: 'newPassword', message: 'newPassword must be at least 12 characters' }])
    })
  })

  describe('without a sign-in', () => {
    it('answers 401', async () => {
      expect((await request(t.app).post('/api/auth/password').send({ currentPassword: GOOD, newPassword: GOOD_2 })).status).toBe(401)
    })
  })
})

describe('POST /api/auth/password-reset and /confirm', () => {
  it('answers 202 with the same body for an unknown address, and sends nothing', async () => {
    const before = await t.context.db.models.OutboxMessage.count()
    const unknown = await request(t.app).post('/api/auth/password-reset').send({ email: 'nobody.here@example.test' })
    await newUser(t, 'forgetful@example.test')
    const known = await request(t.app).post('/api/auth/password-reset').send({ email: 'forgetful@example.test' })
    expect(unknown.status).toBe(202)
    expect(known.status).toBe(202)
    expect(unknown.body).toEqual(known.body)
    await resetMailFor(t, 'forgetful@example.test')
    const sent = await t.context.db.models.OutboxMessage.findAll({ order: [['id', 'ASC']] })
    expect(sent.slice(before).some((m) => m.to.includes('nobody.here@example.test'))).toBe(false)
  })

  it('stores only the hash of the token, valid for 30 minutes', async () => {
    const mail = await resetMailFor(t, 'forgetful@example.test')
    expect(mail).toContain('http://localhost:')
    const token = tokenOf(mail)
    expect(token.length).toBeGreaterThanOrEqual(43) // 256 bits in base64url
    const rows = await t.context.db.models.PasswordResetToken.findAll()
    expect(rows.some((r) => r.tokenHash.includes(token))).toBe(false)
    const row = rows.find((r) => r.tokenHash === createHash('sha256').update(token).digest('hex'))!
    const minutes = (row.expiresAt.getTime() - row.createdAt.getTime()) / 60_000
    expect(minutes).toBeCloseTo(30, 1)
  })

  it('sets the new password with the link once; every session ends; the link then refuses', async () => {
    const session = await signIn(t.app, 'forgetful@example.test', GOOD)
    const token = tokenOf(await resetMailFor(t, 'forgetful@example.test'))
    const weak = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: '123412341234' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.details.issues[0].field).toBe('newPassword')
    const ok = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: GOOD_2 })
    expect(ok.status).toBe(204)
    expect((await request(t.app).get('/api/auth/me').set(bearer(session))).status).toBe(401)
    await signIn(t.app, 'forgetful@example.test', GOOD_2)
    const again = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: 'another fine phrase 88' })
    expect(again.status).toBe(400)
    expect(again.body.error.code).toBe('reset_token_invalid')
  })

  it('refuses an expired link', async () => {
    await newUser(t, 'late@example.test')
    await request(t.app).post('/api/auth/password-reset').send({ email: 'late@example.test' }).expect(202)
    const token = tokenOf(await resetMailFor(t, 'late@example.test'))
    const user = await t.context.db.models.User.findOne({ where: { email: 'late@example.test' } })
    // as if 31 minutes had passed
    await t.context.db.models.PasswordResetToken.update({ expiresAt: new Date(Date.now() - 60_000) }, { where: { userId: user!.id } })
    const res = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, newPassword: GOOD_2 })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('reset_token_invalid')
    await signIn(t.app, 'late@example.test', GOOD)
  })

  it('refuses a made-up token and a malformed e-mail, naming the field', async () => {
    const made = await request(t.app).post('/api/auth/password-reset/confirm').send({ token: 'x'.repeat(43), newPassword: GOOD_2 })
    expect(made.body.error.code).toBe('reset_token_invalid')
    const bad = await request(t.app).post('/api/auth/password-reset').send({ email: 'not an address' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.details.issues[0].field).toBe('email')
  })
})

describe('who may sign up', () => {
  describe('with FLEXSHELF_SIGNUP=off', () => {
    let closed: TestApp
    beforeAll(async () => {
      closed = await startTestApp({ config: { signup: { mode: 'off', domains: [] } } })
    })
    afterAll(() => closed.close())

    it('answers 403 signup_closed, and the options say so; sign-in still works', async () => {
      const res = await request(closed.app).post('/api/auth/signup').send({ email: 'walk.in@example.test', password: GOOD, displayName: 'Walk In' })
      expect(res.status).toBe(403)
      expect(res.body.error.code).toBe('signup_closed')
      expect(res.body.error.message).toContain('ask an admin')
      expect((await request(closed.app).get('/api/auth/options')).body).toMatchObject({ passwordSignin: true, signup: { open: false }, sso: null })
      await signIn(closed.app, 'engineer@demo.flexshelf.test')
    })
  })

  describe('with FLEXSHELF_SIGNUP_DOMAINS', () => {
    let company: TestApp
    beforeAll(async () => {
      company = await startTestApp({ config: { signup: { mode: 'open', domains: ['lumenwick.test', 'lab.lumenwick.test'] } } })
    })
    afterAll(() => company.close())

    it('accepts the company domains and refuses others, naming the e-mail field', async () => {
      const inside = await request(company.app).post('/api/auth/signup').send({ email: 'Rhea@Lab.Lumenwick.test', password: GOOD, displayName: 'Rhea Voss' })
      expect(inside.status).toBe(201)
      const outside = await request(company.app).post('/api/auth/signup').send({ email: 'rhea@lumenwick.test.evil.test', password: GOOD, displayName: 'Rhea Voss' })
      expect(outside.status).toBe(400)
      expect(outside.body.error.details.issues).toEqual([{ field: 'email', message: 'sign-up is open only to e-mail addresses ending in @lumenwick.test, @lab.lumenwick.test' }])
    })
  })
})
