/**
 * Notification e-mails (docs/api.md, "Notifications"): the local outbox in development and
 * tests, the admin's listing, the role-change message, and a dead SMTP server that is
 * logged and marked failed without breaking the change that caused it.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

describe('GET /api/outbox', () => {
  let t: TestApp
  let admin: string
  beforeAll(async () => {
    t = await startTestApp()
    admin = await signInAs(t.app, 'admin')
  })
  afterAll(() => t.close())

  describe('after an admin changes a role', () => {
    it('lists the message to that user, newest first, with to, subject, text and at', async () => {
      const signup = await request(t.app).post('/api/auth/signup').send({ email: 'nell.varga@example.test', password: 'a long enough password', displayName: 'Nell Varga' })
      await request(t.app).patch(`/api/users/${signup.body.user.id}/role`).set(bearer(admin)).send({ role: 'contributor' }).expect(200)
      const res = await request(t.app).get('/api/outbox').set(bearer(admin))
      expect(res.status).toBe(200)
      const [latest] = res.body.messages
      expect(latest).toMatchObject({ to: ['nell.varga@example.test'], subject: 'Flexshelf: your role is now contributor', transport: 'outbox', status: 'sent', error: null })
      expect(latest.text).toContain('from engineer to contributor')
      expect(new Date(latest.at).toString()).not.toBe('Invalid Date')
    })

    it('sends nothing when the role does not change', async () => {
      const before = (await request(t.app).get('/api/outbox').set(bearer(admin))).body.messages.length
      const user = (await t.context.db.models.User.findOne({ where: { email: 'nell.varga@example.test' } }))!
      await request(t.app).patch(`/api/users/${user.id}/role`).set(bearer(admin)).send({ role: 'contributor' }).expect(200)
      expect((await request(t.app).get('/api/outbox').set(bearer(admin))).body.messages).toHaveLength(before)
    })
  })

  describe('as a librarian', () => {
    it('answers 403', async () => {
      expect((await request(t.app).get('/api/outbox').set(bearer(await signInAs(t.app, 'librarian')))).status).toBe(403)
    })
  })
})

describe('with an SMTP server that does not answer', () => {
  let t: TestApp
  beforeAll(async () => {
    // port 9 on the loopback (discard) refuses the connection at once on a machine without it
    t = await startTestApp({ config: { mail: { smtpUrl: 'smtp://127.0.0.1:9', from: 'Flexshelf <flexshelf@example.test>' } } })
  })
  afterAll(() => t.close())

  it('still submits the entry, logs the failure and marks the message failed', async () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined)
    const contributor = await signInAs(t.app, 'contributor')
    const draft = await request(t.app).post('/api/entries').set(bearer(contributor)).send({ family: 'snap-hook', name: 'Cable clip hook' }).expect(201)
    const res = await request(t.app).post(`/api/entries/${draft.body.entry.id}/submit`).set(bearer(contributor))
    expect(res.status).toBe(200)
    expect(res.body.entry.status).toBe('in_review')
    const [message] = (await request(t.app).get('/api/outbox').set(bearer(await signInAs(t.app, 'admin')))).body.messages
    expect(message).toMatchObject({ to: [demoEmail('librarian')], transport: 'smtp', status: 'failed' })
    expect(message.error).toMatch(/ECONNREFUSED|connect/i)
    expect(warn).toHaveBeenCalledWith(expect.stringContaining('failed'))
    warn.mockRestore()
  })
})
