import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, demoEmail, signIn, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let adminToken: string
beforeAll(async () => {
  t = await startTestApp()
  adminToken = await signInAs(t.app, 'admin')
})
afterAll(() => t.close())

async function userByEmail(email: string) {
  return (await t.context.db.models.User.findOne({ where: { email } }))!
}

async function snapshot() {
  const { User, AuditEvent } = t.context.db.models
  const users = (await User.findAll({ order: [['id', 'ASC']] })).map((u) => ({ id: u.id, role: u.role, tokenVersion: u.tokenVersion, updatedAt: u.updatedAt.toISOString() }))
  return { users, auditEvents: await AuditEvent.count() }
}

describe('GET /api/users', () => {
  describe('as an admin', () => {
    it('answers every user without password hashes', async () => {
      const res = await request(t.app).get('/api/users').set(bearer(adminToken))
      expect(res.status).toBe(200)
      const observed = res.body.users.map((u: { email: string; role: string }) => [u.email, u.role])
      expect(observed).toEqual([
        ['engineer@demo.flexshelf.test', 'engineer'],
        ['contributor@demo.flexshelf.test', 'contributor'],
        ['librarian@demo.flexshelf.test', 'librarian'],
        ['admin@demo.flexshelf.test', 'admin'],
      ])
      expect(JSON.stringify(res.body)).not.toContain('passwordHash')
    })
  })

  describe('as a librarian', () => {
    it('answers 403', async () => {
      const res = await request(t.app).get('/api/users').set(bearer(await signInAs(t.app, 'librarian')))
      expect(res.status).toBe(403)
      expect(res.body.error.code).toBe('forbidden')
    })
  })
})

describe('PATCH /api/users/:id/role', () => {
  describe('as an admin granting contributor to an engineer', () => {
    let oldToken: string
    let engineerId: number
    let res: request.Response

    beforeAll(async () => {
      const signup = await request(t.app).post('/api/auth/signup').send({ email: 'promoted@example.test', password: 'a long enough password', displayName: 'Rin Marlow' })
      oldToken = signup.body.token
      engineerId = signup.body.user.id
      res = await request(t.app).patch(`/api/users/${engineerId}/role`).set(bearer(adminToken)).send({ role: 'contributor' })
    })

    it('answers 200 with the user in the new role', () => {
      expect(res.status).toBe(200)
      expect(res.body.user).toMatchObject({ id: engineerId, email: 'promoted@example.test', role: 'contributor' })
    })

    it('writes an audit event with who, when, the old and the new role', async () => {
      const admin = await userByEmail(demoEmail('admin'))
      const event = (await t.context.db.models.AuditEvent.findOne({ where: { action: 'user.role_changed', subjectId: String(engineerId) } }))!
      expect(event.actorId).toBe(admin.id)
      expect(event.subjectType).toBe('user')
      expect(event.details).toMatchObject({ from: 'engineer', to: 'contributor' })
      expect(Math.abs(event.at.getTime() - Date.now())).toBeLessThan(60_000)
    })

    it('revokes the tokens issued before the change', async () => {
      const me = await request(t.app).get('/api/auth/me').set(bearer(oldToken))
      expect(me.status).toBe(401)
      expect(me.body.error.message).toContain('role or password has changed')
    })

    it('lets the user sign in again with the new role', async () => {
      const token = await signIn(t.app, 'promoted@example.test', 'a long enough password')
      const me = await request(t.app).get('/api/auth/me').set(bearer(token))
      expect(me.body.user.role).toBe('contributor')
    })

    it('shows the change in GET /api/audit', async () => {
      const audit = await request(t.app).get('/api/audit').set(bearer(adminToken))
      expect(audit.status).toBe(200)
      const observed = audit.body.events.find((e: { action: string; subjectId: string }) => e.action === 'user.role_changed' && e.subjectId === String(engineerId))
      expect(observed).toMatchObject({ actor: { displayName: 'Ada Quillon' }, subjectType: 'user', details: { from: 'engineer', to: 'contributor' } })
    })
  })

  describe('as an admin revoking librarian', () => {
    it('answers 200 and the librarian is an engineer', async () => {
      const signup = await request(t.app).post('/api/auth/signup').send({ email: 'curator@example.test', password: 'a long enough password', displayName: 'Oma Brisk' })
      await request(t.app).patch(`/api/users/${signup.body.user.id}/role`).set(bearer(adminToken)).send({ role: 'librarian' }).expect(200)
      const res = await request(t.app).patch(`/api/users/${signup.body.user.id}/role`).set(bearer(adminToken)).send({ role: 'engineer' })
      expect(res.status).toBe(200)
      expect((await userByEmail('curator@example.test')).role).toBe('engineer')
    })
  })

  describe('as an engineer', () => {
    it('answers 403 and nothing changes', async () => {
      const before = await snapshot()
      const engineer = await userByEmail(demoEmail('engineer'))
      const res = await request(t.app).patch(`/api/users/${engineer.id}/role`).set(bearer(await signInAs(t.app, 'engineer'))).send({ role: 'librarian' })
      expect(res.status).toBe(403)
      expect(res.body.error.code).toBe('forbidden')
      expect(await snapshot()).toEqual(before)
    })
  })

  describe('as a librarian', () => {
    it('answers 403 and nothing changes', async () => {
      const before = await snapshot()
      const contributor = await userByEmail(demoEmail('contributor'))
      const res = await request(t.app).patch(`/api/users/${contributor.id}/role`).set(bearer(await signInAs(t.app, 'librarian'))).send({ role: 'librarian' })
      expect(res.status).toBe(403)
      expect(await snapshot()).toEqual(before)
    })
  })

  describe('as an admin changing their own role', () => {
    it('answers 403 and nothing changes', async () => {
      const before = await snapshot()
      const admin = await userByEmail(demoEmail('admin'))
      const res = await request(t.app).patch(`/api/users/${admin.id}/role`).set(bearer(adminToken)).send({ role: 'engineer' })
      expect(res.status).toBe(403)
      expect(res.body.error.message).toBe('you cannot change your own role')
      expect(await snapshot()).toEqual(before)
    })
  })

  describe("as an admin changing another admin's role", () => {
    it('answers 403 and nothing changes', async () => {
      const { User } = t.context.db.models
      const other = await User.create({ email: 'second.admin@example.test', displayName: 'Vesna Torr', role: 'admin', passwordHash: 'x' })
      const before = await snapshot()
      const res = await request(t.app).patch(`/api/users/${other.id}/role`).set(bearer(adminToken)).send({ role: 'engineer' })
      expect(res.status).toBe(403)
      expect(await snapshot()).toEqual(before)
    })
  })

  describe('as an admin, for a user that does not exist', () => {
    it('answers 404 and nothing changes', async () => {
      const before = await snapshot()
      const res = await request(t.app).patch('/api/users/999999/role').set(bearer(adminToken)).send({ role: 'contributor' })
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
      expect(await snapshot()).toEqual(before)
    })

    it('answers 404 for an id that is not a number', async () => {
      const res = await request(t.app).patch('/api/users/abc/role').set(bearer(adminToken)).send({ role: 'contributor' })
      expect(res.status).toBe(404)
    })
  })

  describe('as an admin granting admin', () => {
    it('answers 400 naming the role field and nothing changes', async () => {
      const before = await snapshot()
      const engineer = await userByEmail(demoEmail('engineer'))
      const res = await request(t.app).patch(`/api/users/${engineer.id}/role`).set(bearer(adminToken)).send({ role: 'admin' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'role', message: 'role must be one of engineer, contributor, librarian' }])
      expect(await snapshot()).toEqual(before)
    })
  })

  describe('as an admin setting the role a user already has', () => {
    it('answers 200, writes no audit event and keeps the user signed in', async () => {
      const engineerToken = await signInAs(t.app, 'engineer')
      const before = await snapshot()
      const engineer = await userByEmail(demoEmail('engineer'))
      const res = await request(t.app).patch(`/api/users/${engineer.id}/role`).set(bearer(adminToken)).send({ role: 'engineer' })
      expect(res.status).toBe(200)
      expect(await snapshot()).toEqual(before)
      expect((await request(t.app).get('/api/auth/me').set(bearer(engineerToken))).status).toBe(200)
    })
  })
})
