/**
 * A Flexshelf app on a fresh temporary data folder, mounted in-process for supertest.
 * bcrypt runs at its lowest cost here so the suite stays fast; the default is tested apart.
 */
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import request from 'supertest'
import type { Express } from 'express'
import { createApp, type AppOptions } from '../../api/app'
import { checkResponse, ContractViolation } from '../../contract'
import { loadConfig, type Config } from '../../api/config'
import type { AppContext } from '../../api/context'
import { openDatabase } from '../../api/db'
import { DEMO_PASSWORD, DEMO_USERS } from '../../api/db/demo-shelf'
import { seedDemoData, type SeedReport } from '../../api/db/seed'
import type { Role } from '../../api/roles'

const TEST_BCRYPT_COST = 4

/**
 * Every JSON answer of a test app is held to the wire contract (contract/): a body outside it
 * is refused with a 500 naming the route and the fields, so every API test parses every
 * route's response it receives. The violations are kept for the test that wants to see them.
 */
const contractViolations: ContractViolation[] = []
function checkAgainstContract(route: string, status: number, body: unknown) {
  try {
    checkResponse(route, status, body)
  } catch (err) {
    if (err instanceof ContractViolation) contractViolations.push(err)
    throw err
  }
}

/** True under npm run test:pg (tests/api/setup-database.ts): tests of SQLite files themselves skip there. */
export const onPostgres = Boolean(process.env.FLEXSHELF_TEST_DATABASE_URL)

export interface TestApp {
  app: Express
  context: AppContext
  dataDir: string
  seed: SeedReport | null
  /** Serious errors the error handler logged (500s). */
  logged: unknown[]
  close(): Promise<void>
}

export interface TestAppOptions {
  config?: Partial<Config>
  seed?: boolean
  app?: AppOptions
}

export function makeTempDir(prefix = 'flexshelf-api-'): string {
  return mkdtempSync(join(tmpdir(), prefix))
}

export function testConfig(dataDir: string, overrides: Partial<Config> = {}): Config {
  return loadConfig({ FLEXSHELF_DATA: dataDir }, {
    bcryptCost: TEST_BCRYPT_COST,
    // many sign-ups and sign-ins from one loopback address per test file; the limits are tested apart
    signupRateLimit: { windowMs: 60 * 60 * 1000, limit: 10_000 },
    // tests mount the app without the web build unless they ask for one
    webDir: join(dataDir, 'no-web-build'),
    // request logs would drown the test output; tests that read them pass a logger
    logLevel: 'silent',
    ...overrides,
  })
}

export async function startTestApp(options: TestAppOptions = {}): Promise<TestApp> {
  const dataDir = makeTempDir()
  const config = testConfig(dataDir, options.config)
  const db = await openDatabase(config.databaseFile)
  const context: AppContext = { config, db }
  const seed = options.seed === false ? null : await seedDemoData(context)
  const logged: unknown[] = []
  const app = createApp(context, { log: (err) => logged.push(err), checkResponse: checkAgainstContract, ...options.app })
  return {
    app, context, dataDir, seed, logged,
    async close() {
      await db.close()
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}

export function demoEmail(role: Role): string {
  return DEMO_USERS.find((u) => u.role === role)!.email
}

export async function signIn(app: Express, email: string, password: string = DEMO_PASSWORD): Promise<string> {
  const res = await request(app).post('/api/auth/signin').send({ email, password })
  if (res.status !== 200) throw new Error(`sign-in as ${email} answered ${res.status}: ${JSON.stringify(res.body)}`)
  return res.body.token as string
}

export function signInAs(app: Express, role: Role): Promise<string> {
  return signIn(app, demoEmail(role))
}

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` })
