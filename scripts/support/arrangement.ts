/**
 * The several-instance arrangement on loopback for the tests and the load benchmark: a
 * throwaway PostgreSQL cluster, a Redis server with nothing on disk, the local S3 fake, and any
 * number of API instances (`npm run serve`'s entry) and workers (`npm run worker`'s), each a
 * child process on its own free port. stop() ends every process this started.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { startFakeS3, type FakeS3 } from './fake-s3'
import { freePort } from './free-port'
import { startPostgresCluster, type PostgresCluster } from './postgres-cluster'

const ROOT = resolve(import.meta.dirname, '../..')

export interface Proc {
  name: string
  child: ChildProcess
  output: string[]
  port?: number
  url?: string
}

export interface Arrangement {
  env: Record<string, string>
  pg: PostgresCluster
  s3: FakeS3
  startApi(name: string, extra?: Record<string, string>): Promise<Proc>
  startWorker(name: string, extra?: Record<string, string>): Promise<Proc>
  kill(proc: Proc, signal?: NodeJS.Signals): Promise<void>
  stop(): Promise<void>
}

function launch(name: string, script: string, env: Record<string, string>, ready: RegExp, timeoutMs = 60_000): Promise<Proc> {
  // node itself with tsx's loader (not the tsx wrapper), so a SIGKILL reaches the process that holds the jobs
  const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, script)], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] })
  const proc: Proc = { name, child, output: [] }
  return new Promise((resolveReady, reject) => {
    const timer = setTimeout(() => reject(new Error(`${name} did not start in ${timeoutMs} ms:\n${proc.output.join('')}`)), timeoutMs)
    const seen = (chunk: Buffer) => {
      proc.output.push(chunk.toString())
      if (ready.test(proc.output.join(''))) {
        clearTimeout(timer)
        resolveReady(proc)
      }
    }
    child.stdout!.on('data', seen)
    child.stderr!.on('data', seen)
    child.once('exit', (code) => {
      clearTimeout(timer)
      reject(new Error(`${name} exited (${code}) before it was ready:\n${proc.output.join('')}`))
    })
  })
}

async function startRedis(dir: string): Promise<{ url: string; child: ChildProcess }> {
  const port = await freePort()
  const child = spawn('redis-server', ['--port', String(port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no', '--dir', dir], { stdio: ['ignore', 'pipe', 'pipe'] })
  await new Promise<void>((ok, fail) => {
    let out = ''
    const timer = setTimeout(() => fail(new Error(`redis-server did not start: ${out}`)), 20_000)
    child.stdout!.on('data', (c: Buffer) => {
      out += c.toString()
      if (/Ready to accept connections/.test(out)) {
        clearTimeout(timer)
        ok()
      }
    })
    child.once('error', fail)
  })
  return { url: `redis://127.0.0.1:${port}/0`, child }
}

export async function startArrangement(): Promise<Arrangement> {
  const dir = mkdtempSync(join(tmpdir(), 'flexshelf-arrangement-'))
  const pg = await startPostgresCluster()
  const redis = await startRedis(dir)
  const s3 = await startFakeS3({ directory: join(dir, 's3'), bucket: 'flexshelf-arrangement' })
  const env: Record<string, string> = {
    NODE_ENV: 'development',
    FLEXSHELF_DATABASE_URL: pg.url,
    FLEXSHELF_REDIS_URL: redis.url,
    // every instance signs and checks the same sessions
    FLEXSHELF_JWT_SECRET: 'arrangement-test-secret-of-forty-characters!',
    FLEXSHELF_BCRYPT_COST: '10',
    FLEXSHELF_QUEUE_LOCK_MS: '2000',
    FLEXSHELF_WORKER_CONCURRENCY: '1',
    // two cores shared by seven processes here: a generous budget, so a slow moment is not a failure
    FLEXSHELF_COMPUTE_BUDGET_MS: '30000',
    ...s3.env,
  }
  const procs: Proc[] = []
  const kill = async (proc: Proc, signal: NodeJS.Signals = 'SIGKILL') => {
    if (proc.child.exitCode !== null || proc.child.signalCode !== null) return
    const exited = new Promise((ok) => proc.child.once('exit', ok))
    proc.child.kill(signal)
    await exited
  }
  return {
    env,
    pg,
    s3,
    async startApi(name, extra = {}) {
      const port = await freePort()
      const data = mkdtempSync(join(dir, `${name}-`))
      const proc = await launch(name, 'api/server.ts', { ...env, PORT: String(port), FLEXSHELF_DATA: data, ...extra }, /Flexshelf is running at/)
      proc.port = port
      proc.url = `http://127.0.0.1:${port}`
      procs.push(proc)
      return proc
    },
    async startWorker(name, extra = {}) {
      const data = mkdtempSync(join(dir, `${name}-`))
      const proc = await launch(name, 'api/worker.ts', { ...env, FLEXSHELF_DATA: data, ...extra }, /Flexshelf worker ready/)
      procs.push(proc)
      return proc
    },
    kill,
    async stop() {
      await Promise.allSettled(procs.map((p) => kill(p, 'SIGKILL')))
      redis.child.kill('SIGKILL')
      await s3.stop().catch(() => undefined)
      pg.stop()
      rmSync(dir, { recursive: true, force: true })
    },
  }
}

/** JSON over loopback with a bearer token. */
export async function api(base: string, path: string, token: string | null, init: { method?: string; body?: unknown } = {}): Promise<{ status: number; body: any }> {
  const res = await fetch(`${base}${path}`, {
    method: init.method ?? (init.body === undefined ? 'GET' : 'POST'),
    headers: { ...(token ? { Authorization: `Bearer ${token}` } : {}), ...(init.body !== undefined ? { 'Content-Type': 'application/json' } : {}) },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  })
  const text = await res.text()
  let body: unknown = text
  try {
    body = JSON.parse(text)
  } catch {
    // a file or text answer
  }
  return { status: res.status, body }
}
