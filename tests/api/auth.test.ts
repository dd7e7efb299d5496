import { existsSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import jwt from 'jsonwebtoken'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ConfigError, DEFAULT_BCRYPT_COST, loadConfig } from '../../api/config'
import { bearer, demoEmail, makeTempDir, signIn, startTestApp, type TestApp } from './helpers'

let t: TestApp
beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())

const newAccount = (email: string) => ({ email, password: 'correct horse battery', displayName: 'Quill Ardent' })

describe('POST /api/auth/signup', () => {
  describe('with a new e-mail and a good password', () => {
    it('answers 201 with a token and an engineer', async () => {
      const res = await request(t.app).post('/api/auth/signup').send(newAccount('New.Person@Example.test'))
      expect(res.status).toBe(201)
      expect(res.body.user).toMatchObject({ email: 'new.person@example.test', displayName: 'Quill Ardent', role: 'engineer' })
      expect(res.body.user).not.toHaveProperty('passwordHash')
      const me = await request(t.app).get('/api/auth/me').set(bearer(res.body.token))
      expect(me.status).toBe(200)
      expect(me.body.user.email).toBe('new.person@example.test')
    })

    it('stores a bcrypt hash, never the password', async () => {
      const user = await t.context.db.models.User.findOne({ where: { email: 'new.person@example.test' } })
      expect(user!.passwordHash).toMatch(/^\$2[aby]\$04\$/)
      expect(user!.passwordHash).not.toContain('correct horse')
    })
  })

  describe('asking for a higher role', () => {
    it('answers 400 naming the field and creates nobody', async () => {
      const res = await request(t.app).post('/api/auth/signup').send({ ...newAccount('climber@example.test'), role: 'admin' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'role', message: 'role is not an accepted field' }])
      expect(await t.context.db.models.User.count({ where: { email: 'climber@example.test' } })).toBe(0)
    })
  })

  describe('with an e-mail already registered', () => {
    it('answers 409 conflict, whatever the letter case', async () => {
      const res = await request(t.app).post('/api/auth/signup').send(newAccount('ENGINEER@demo.flexshelf.test'))
      expect(res.status).toBe(409)
      expect(res.body.error.code).toBe('conflict')
      expect(await t.context.db.models.User.count({ where: { email: 'engineer@demo.flexshelf.test' } })).toBe(1)
    })
  })

  describe('with a weak password', () => {
    it('answers 400 naming the length rule when it is too short', async () => {
      const res = await request(t.app).post('/api/auth/signup').send({ ...newAccount('short@example.test'), password: 'eleven char' })
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('validation_failed')
      expect(res.body.error.details.issues).toEqual([{ field: 'password', message: 'password must be at least 12 characters' }])
      expect(res.body.error.message).toContain('at least 12 characters')
    })

    it('answers 400 naming the 72-byte bcrypt rule when it is too long', async () => {
      // 37 two-byte characters: 37 characters, 74 bytes
      const res = await request(t.app).post('/api/auth/signup').send({ ...newAccount('long@example.test'), password: 'é'.repeat(37) })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues[0].field).toBe('password')
      expect(res.body.error.details.issues[0].message).toContain('at most 72 bytes')
    })
  })

  describe('with several bad fields', () => {
    it('answers 400 with one issue per field', async () => {
      const res = await request(t.app).post('/api/auth/signup').send({ email: 'not-an-address', password: 'x' })
      expect(res.status).toBe(400)
      const fields = res.body.error.details.issues.map((i: { field: string }) => i.field).sort()
      expect(fields).toEqual(['displayName', 'email', 'password'])
    })
  })

  describe('with a body that is not JSON', () => {
    it('answers 400 malformed_json', async () => {
      const res = await request(t.app).post('/api/auth/signup').set('Content-Type', 'application/json').send('{"email": "a@b.test",')
      expect(res.status).toBe(400)
      expect(res.body).toEqual({ error: { code: 'malformed_json', message: 'the request body is not valid JSON', details: null } })
    })
  })

  describe('with a body over the 256 kB limit', () => {
    it('answers 413 payload_too_large', async () => {
      const res = await request(t.app).post('/api/auth/signup').send({ ...newAccount('big@example.test'), displayName: 'x'.repeat(300 * 1024) })
      expect(res.status).toBe(413)
      expect(res.body.error.code).toBe('payload_too_large')
      expect(await t.context.db.models.User.count({ where: { email: 'big@example.test' } })).toBe(0)
    })
  })
})

describe('POST /api/auth/signin', () => {
  describe('with the right password', () => {
    it('answers 200 with a token for the user', async () => {
      const res = await request(t.app).post('/api/auth/signin').send({ email: demoEmail('librarian'), password: 'flexshelf-demo' })
      expect(res.status).toBe(200)
      expect(res.body.user).toMatchObject({ email: demoEmail('librarian'), role: 'librarian' })
      expect(typeof res.body.token).toBe('string')
    })

    it('issues an HS256 token that expires after 8 hours', async () => {
      const token = await signIn(t.app, demoEmail('engineer'))
      const decoded = jwt.decode(token, { complete: true })!
      expect(decoded.header.alg).toBe('HS256')
      const payload = decoded.payload as jwt.JwtPayload
      expect(payload.exp! - payload.iat!).toBe(8 * 3600)
      expect(payload.jti).toMatch(/^[0-9a-f-]{36}$/)
    })
  })

  describe('with a wrong password or an unknown e-mail', () => {
    it('answers 401 with the same generic message for both', async () => {
      const wrong = await request(t.app).post('/api/auth/signin').send({ email: demoEmail('admin'), password: 'not the password' })
      const unknown = await request(t.app).post('/api/auth/signin').send({ email: 'nobody@example.test', password: 'not the password' })
      expect(wrong.status).toBe(401)
      expect(unknown.status).toBe(401)
      expect(wrong.body).toEqual({ error: { code: 'unauthenticated', message: 'e-mail or password is wrong', details: null } })
      expect(unknown.body).toEqual(wrong.body)
    })
  })
})

describe('the sign-in rate limit', () => {
  let limited: TestApp
  beforeAll(async () => {
    limited = await startTestApp({ config: { signinRateLimit: { windowMs: 60_000, limit: 3 } } })
  })
  afterAll(() => limited.close())

  describe('after the limit of failed attempts from one address', () => {
    it('answers 429 rate_limited, even to the right password', async () => {
      const attempt = (password: string) => request(limited.app).post('/api/auth/signin').send({ email: demoEmail('engineer'), password })
      for (let i = 0; i < 3; i++) expect((await attempt('guess number ' + i)).status).toBe(401)
      const blocked = await attempt('flexshelf-demo')
      expect(blocked.status).toBe(429)
      expect(blocked.body.error.code).toBe('rate_limited')
      expect(blocked.body.error.message).toContain('too many failed sign-in attempts')
    })

    it('limits another e-mail from the same address too, and not another address', async () => {
      const from = (address: string) => request(limited.app).post('/api/auth/signin').set('X-Forwarded-For', address)
        .send({ email: demoEmail('contributor'), password: 'flexshelf-demo' })
      expect((await from('127.0.0.1')).status).toBe(429)
      expect((await from('10.20.30.40')).status).toBe(200)
    })
  })

  describe('for successful sign-ins', () => {
    it('does not count them', async () => {
      for (let i = 0; i < 5; i++) {
        const res = await request(limited.app).post('/api/auth/signin').set('X-Forwarded-For', '10.20.30.41').send({ email: demoEmail('librarian'), password: 'flexshelf-demo' })
        expect(res.status).toBe(200)
      }
    })
  })
})

describe('POST /api/auth/signout', () => {
  describe('as a signed-in user', () => {
    it('answers 204 and the token no longer works', async () => {
      const token = await signIn(t.app, demoEmail('contributor'))
      expect((await request(t.app).get('/api/auth/me').set(bearer(token))).status).toBe(200)
      const out = await request(t.app).post('/api/auth/signout').set(bearer(token))
      expect(out.status).toBe(204)
      const after = await request(t.app).get('/api/auth/me').set(bearer(token))
      expect(after.status).toBe(401)
      expect(after.body.error.message).toContain('signed out')
    })

    it('leaves the same user\u2019s other sessions open', async () => {
      const first = await signIn(t.app, demoEmail('contributor'))
      const second = await signIn(t.app, demoEmail('contributor'))
      await request(t.app).post('/api/auth/signout').set(bearer(first)).expect(204)
      expect((await request(t.app).get('/api/auth/me').set(bearer(second))).status).toBe(200)
    })
  })
})

describe('GET /api/auth/me', () => {
  describe('as a signed-in user', () => {
    it('answers the user', async () => {
      const token = await signIn(t.app, demoEmail('admin'))
      const res = await request(t.app).get('/api/auth/me').set(bearer(token))
      expect(res.status).toBe(200)
      expect(res.body).toEqual({ user: { id: expect.any(Number), email: demoEmail('admin'), displayName: expect.any(String), role: 'admin', createdAt: expect.any(String), hasPassword: true, mustChangePassword: false, sso: false } })
    })
  })

  describe('with a forged or tampered token', () => {
    const secret = () => t.context.config.jwtSecret

    it('refuses an unsigned token (alg none)', async () => {
      const unsigned = jwt.sign({ ver: 0 }, '', { algorithm: 'none', subject: '4', jwtid: 'x' })
      expect((await request(t.app).get('/api/auth/me').set(bearer(unsigned))).status).toBe(401)
    })

    it('refuses a token signed with another algorithm', async () => {
      const hs512 = jwt.sign({ ver: 0 }, secret(), { algorithm: 'HS512', subject: '4', jwtid: 'y', expiresIn: '1h' })
      expect((await request(t.app).get('/api/auth/me').set(bearer(hs512))).status).toBe(401)
    })

    it('refuses a token signed with another secret', async () => {
      const other = jwt.sign({ ver: 0 }, 'some other secret', { algorithm: 'HS256', subject: '4', jwtid: 'z', expiresIn: '1h' })
      expect((await request(t.app).get('/api/auth/me').set(bearer(other))).status).toBe(401)
    })

    it('refuses an expired token with a message saying so', async () => {
      const expired = jwt.sign({ ver: 0, exp: Math.floor(Date.now() / 1000) - 60 }, secret(), { algorithm: 'HS256', subject: '4', jwtid: 'w' })
      const res = await request(t.app).get('/api/auth/me').set(bearer(expired))
      expect(res.status).toBe(401)
      expect(res.body.error.message).toContain('expired')
    })

    it('refuses a header that is not a bearer token', async () => {
      const res = await request(t.app).get('/api/auth/me').set('Authorization', 'Basic abc')
      expect(res.status).toBe(401)
      expect(res.body.error.code).toBe('unauthenticated')
    })
  })
})

describe('the configuration', () => {
  describe('by default', () => {
    it('hashes with a bcrypt cost of at least 10', () => {
      const dataDir = makeTempDir()
      try {
        expect(DEFAULT_BCRYPT_COST).toBeGreaterThanOrEqual(10)
        expect(loadConfig({ FLEXSHELF_DATA: dataDir }).bcryptCost).toBeGreaterThanOrEqual(10)
      } finally {
        rmSync(dataDir, { recursive: true, force: true })
      }
    })

    it('refuses a cost below 10 from the environment', () => {
      expect(() => loadConfig({ FLEXSHELF_DATA: makeTempDir(), FLEXSHELF_BCRYPT_COST: '4' })).toThrow(/FLEXSHELF_BCRYPT_COST/)
    })
  })

  describe('outside production without a secret', () => {
    it('generates one in the data folder and keeps it across restarts', () => {
      const dataDir = makeTempDir()
      try {
        const first = loadConfig({ FLEXSHELF_DATA: dataDir }).jwtSecret
        const file = join(dataDir, 'jwt-secret')
        expect(existsSync(file)).toBe(true)
        expect(readFileSync(file, 'utf8').trim()).toBe(first)
        expect(first.length).toBeGreaterThanOrEqual(32)
        expect(loadConfig({ FLEXSHELF_DATA: dataDir }).jwtSecret).toBe(first)
      } finally {
        rmSync(dataDir, { recursive: true, force: true })
      }
    })
  })

  describe('in production', () => {
    it('refuses to start without FLEXSHELF_JWT_SECRET', () => {
      expect(() => loadConfig({ NODE_ENV: 'production', FLEXSHELF_DATA: makeTempDir() })).toThrow(ConfigError)
      expect(() => loadConfig({ NODE_ENV: 'production', FLEXSHELF_DATA: makeTempDir() })).toThrow(/FLEXSHELF_JWT_SECRET must be set in production/)
    })

    it('takes the secret from the environment and does not seed demo data', () => {
      const secret = 'Qe7-hW2mZr9KxVb4NcTy1LpAs6DgFj3Uo8Ri5E'
      const config = loadConfig({ NODE_ENV: 'production', FLEXSHELF_DATA: makeTempDir(), FLEXSHELF_JWT_SECRET: secret })
      expect(config.jwtSecret).toBe(secret)
      expect(config.seedDemo).toBe(false)
    })
  })
})
