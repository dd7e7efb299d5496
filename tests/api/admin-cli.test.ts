/**
 * The admin command line as a real process over a production data folder, and the
 * production server's refusals: a weak JWT secret, demo accounts still in the folder.
 */
import { spawn, spawnSync } from 'node:child_process'
import { rmSync } from 'node:fs'
import { join } from 'node:path'
import request from 'supertest'
import { afterAll, describe, expect, it } from 'vitest'
import { createApp } from '../../api/app'
import { loadConfig } from '../../api/config'
import { openDatabase } from '../../api/db'
import { seedDemoData } from '../../api/db/seed'
import { describeWeakSecret } from '../../api/secret-strength'
import { generateSecret } from '../../api/services/admin-accounts'
import { bearer, makeTempDir, onPostgres, testConfig } from './helpers'

const root = join(import.meta.dirname, '..', '..')
const tsx = join(root, 'node_modules', '.bin', 'tsx')
const dirs: string[] = []
afterAll(() => {
  for (const dir of dirs) rmSync(dir, { recursive: true, force: true })
})
function freshDir(): string {
  const dir = makeTempDir('flexshelf-admin-')
  dirs.push(dir)
  return dir
}

const STRONG_SECRET = 'Zp4-Wq9xLm2VbT7cRy1NsK6eHu3GdJ8fAo5Ei0'

function admin(dataDir: string, args: string[], stdin = ''): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(tsx, ['api/cli/admin.ts', ...args], {
    cwd: root,
    input: stdin,
    encoding: 'utf8',
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', NODE_ENV: 'production', FLEXSHELF_DATA: dataDir, FLEXSHELF_BCRYPT_COST: '10' },
  })
  return { status: result.status, stdout: result.stdout, stderr: result.stderr }
}

/** Starts the production server and resolves with its first lines, or its exit and output. */
function productionServer(dataDir: string, secret: string): Promise<{ code: number | null; output: string; url: string | null; stop: () => void }> {
  const child = spawn(tsx, ['api/server.ts'], {
    cwd: root,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', NODE_ENV: 'production', PORT: '0', FLEXSHELF_DATA: dataDir, FLEXSHELF_JWT_SECRET: secret, FLEXSHELF_LOG_LEVEL: 'warn', FLEXSHELF_COMPUTE_THREADS: '0' },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let output = ''
  return new Promise((resolve) => {
    const timer = setTimeout(() => { child.kill('SIGKILL'); resolve({ code: null, output, url: null, stop: () => {} }) }, 45_000)
    const onData = (d: Buffer) => {
      output += String(d)
      const m = /running at http:\/\/localhost:(\d+)/.exec(output)
      if (m) {
        clearTimeout(timer)
        resolve({ code: null, output, url: `http://127.0.0.1:${m[1]}`, stop: () => child.kill('SIGTERM') })
      }
    }
    child.stdout.on('data', onData)
    child.stderr.on('data', onData)
    child.on('exit', (code) => { clearTimeout(timer); resolve({ code, output, url: null, stop: () => {} }) })
  })
}

describe('npm run admin -- secret', () => {
  it('prints a new strong secret (384 random bits)', () => {
    const a = admin(freshDir(), ['secret'])
    expect(a.status).toBe(0)
    expect(a.stdout.trim()).toMatch(/^[A-Za-z0-9_-]{64}$/)
    expect(describeWeakSecret(a.stdout.trim(), 32)).toBeNull()
    expect(generateSecret()).not.toBe(a.stdout.trim())
  })
})

// The command line and the production server run as child processes over a data folder's
// SQLite file; under test:pg the test's own database would be PostgreSQL, so these two run
// on SQLite only (the command line shares its database code with the server either way).
describe.skipIf(onPostgres)('a first start in production', () => {
  const dataDir = freshDir()

  it('adds the first admin with the password from standard input, and the server lets them in', async () => {
    const added = admin(dataDir, ['add', '--email', 'Noor.Halvorsen@Lumenwick.test', '--name', 'Noor Halvorsen', '--role', 'admin', '--password-stdin'], 'amber trellis quarry 61\n')
    expect(added.stderr).toContain('Added Noor Halvorsen <noor.halvorsen@lumenwick.test> as admin')
    expect(added.status).toBe(0)
    expect(added.stdout).toBe('')
    const server = await productionServer(dataDir, STRONG_SECRET)
    try {
      expect(server.url, server.output).not.toBeNull()
      const res = await fetch(`${server.url}/api/auth/signin`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email: 'noor.halvorsen@lumenwick.test', password: 'amber trellis quarry 61' }) })
      expect(res.status).toBe(200)
      expect((await res.json()).user.role).toBe('admin')
      // the built-in materials are reference data, there in production too
      const { token } = await (await fetch(`${server.url}/api/auth/signin`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email: 'noor.halvorsen@lumenwick.test', password: 'amber trellis quarry 61' }) })).json()
      const materials = await (await fetch(`${server.url}/api/materials`, { headers: bearer(token) })).json()
      expect(materials.materials.length).toBeGreaterThan(0)
    } finally {
      server.stop()
    }
  })

  it('refuses a weak password from standard input, naming the rule, and adds nobody', () => {
    const res = admin(dataDir, ['add', '--email', 'weak@lumenwick.test', '--name', 'Weak Link', '--role', 'engineer', '--password-stdin'], '1111111111111\n')
    expect(res.status).toBe(1)
    expect(res.stderr).toMatch(/^password: password is too easy to guess/m)
    const missing = admin(dataDir, ['add', '--name', 'No Mail', '--generate'])
    expect(missing.status).toBe(1)
    expect(missing.stderr).toContain('--email is required')
  })

  it('gives a one-time password with --generate, which must be changed before anything else', async () => {
    const res = admin(dataDir, ['add', '--email', 'tobin@lumenwick.test', '--name', 'Tobin Achterberg', '--role', 'librarian', '--generate'])
    expect(res.status).toBe(0)
    const oneTime = res.stdout.trim()
    expect(oneTime).toMatch(/^[A-Za-z0-9_-]{20}$/)
    const config = testConfig(dataDir, { jwtSecret: STRONG_SECRET, bcryptCost: 10 })
    const db = await openDatabase(config.databaseFile)
    try {
      const app = createApp({ config, db }, { log: () => {} })
      const signin = await request(app).post('/api/auth/signin').send({ email: 'tobin@lumenwick.test', password: oneTime })
      expect(signin.body.user).toMatchObject({ role: 'librarian', mustChangePassword: true })
      const blocked = await request(app).get('/api/entries').set(bearer(signin.body.token))
      expect(blocked.status).toBe(403)
      expect(blocked.body.error.code).toBe('password_change_required')
      await request(app).post('/api/auth/password').set(bearer(signin.body.token)).send({ currentPassword: oneTime, newPassword: 'pewter harbour lilac 93' }).expect(204)
      expect((await request(app).get('/api/entries').set(bearer(signin.body.token))).status).toBe(200)
    } finally {
      await db.close()
    }
  })

  it('lists, changes roles (admin included, never the last admin away), resets passwords; all audited', async () => {
    const grant = admin(dataDir, ['set-role', '--email', 'tobin@lumenwick.test', '--role', 'admin'])
    expect(grant.stderr).toContain('librarian → admin')
    expect(admin(dataDir, ['set-role', '--email', 'tobin@lumenwick.test', '--role', 'engineer']).status).toBe(0)
    const last = admin(dataDir, ['set-role', '--email', 'noor.halvorsen@lumenwick.test', '--role', 'engineer'])
    expect(last.status).toBe(1)
    expect(last.stderr).toContain('only admin')
    const reset = admin(dataDir, ['reset-password', '--email', 'tobin@lumenwick.test', '--generate'])
    expect(reset.stdout.trim()).toMatch(/^[A-Za-z0-9_-]{20}$/)
    const list = JSON.parse(admin(dataDir, ['list', '--json']).stdout) as Array<{ email: string; role: string }>
    expect(list.map((u) => [u.email, u.role])).toEqual([['noor.halvorsen@lumenwick.test', 'admin'], ['tobin@lumenwick.test', 'engineer']])
    const db = await openDatabase(join(dataDir, 'flexshelf.sqlite'))
    try {
      const events = await db.models.AuditEvent.findAll({ order: [['id', 'ASC']] })
      expect(events.map((e) => e.action)).toEqual(['user.created', 'user.created', 'user.password_changed', 'user.role_changed', 'user.role_changed', 'user.password_reset'])
      expect(events.filter((e) => e.actorId === null).every((e) => e.details.via === 'command line' && typeof e.details.by === 'string')).toBe(true)
      expect(JSON.stringify(events.map((e) => e.details))).not.toContain('amber trellis')
    } finally {
      await db.close()
    }
  })

  it('refuses to start with a secret of 32 spaces, saying how to make one', async () => {
    const server = await productionServer(dataDir, ' '.repeat(32))
    expect(server.url).toBeNull()
    expect(server.code).toBe(1)
    expect(server.output).toContain('Flexshelf cannot start: FLEXSHELF_JWT_SECRET is only whitespace; make a new one with `npm run --silent admin -- secret`')
  })

  const weak: Array<[string, string, RegExp]> = [
    ['one repeated character', 'k'.repeat(48), /is one character repeated/],
    ['two characters in turn', 'ab'.repeat(24), /is too predictable \(about 48 bits/],
    ['a short one', 'Zp4-Wq9xLm2VbT7cRy1N', /must be at least 32 characters \(it has 20\)/],
    ['padding around it', ` ${STRONG_SECRET} `, /starts or ends with whitespace/],
  ]
  for (const [name, secret, message] of weak) {
    it(`refuses ${name}`, () => {
      expect(() => loadConfig({ NODE_ENV: 'production', FLEXSHELF_DATA: dataDir, FLEXSHELF_JWT_SECRET: secret })).toThrow(message)
    })
  }

  it('accepts random secrets like those of `openssl rand -hex 16` and `-base64 32`', () => {
    // drawn once from crypto.randomBytes(16) and (32)
    for (const secret of ['4eac62842aab79634d542f0c53e34ae3', 't4Odtuni4BfcYOPi0fiazsUd0KntCTAfoNZRdVFf/8w=', generateSecret()]) {
      expect(loadConfig({ NODE_ENV: 'production', FLEXSHELF_DATA: dataDir, FLEXSHELF_JWT_SECRET: secret }).jwtSecret).toBe(secret)
    }
  })
})

describe.skipIf(onPostgres)('a production server over a folder with demo accounts', () => {
  it('refuses to start, says how to remove them, and starts once they are removed', async () => {
    const dataDir = freshDir()
    const config = testConfig(dataDir)
    const db = await openDatabase(config.databaseFile)
    await seedDemoData({ config, db })
    await db.close()
    const refused = await productionServer(dataDir, STRONG_SECRET)
    expect(refused.code).toBe(1)
    expect(refused.output).toContain('admin@demo.flexshelf.test')
    expect(refused.output).toContain('npm run --silent admin -- remove-demo')
    const removed = admin(dataDir, ['remove-demo'])
    expect(removed.status).toBe(0)
    // the demo shelf's entries name the contributor and librarian, so those lose their password instead
    expect(removed.stderr).toMatch(/admin@demo\.flexshelf\.test/)
    const started = await productionServer(dataDir, STRONG_SECRET)
    try {
      expect(started.url, started.output).not.toBeNull()
      const res = await fetch(`${started.url}/api/auth/signin`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email: 'librarian@demo.flexshelf.test', password: 'flexshelf-demo' }) })
      expect(res.status).toBe(401)
    } finally {
      started.stop()
    }
  })
})

