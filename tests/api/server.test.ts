/** The server entry as a real process: configuration, migration, seed, listen, print the URL. */
import { spawn, type ChildProcess } from 'node:child_process'
import { chmodSync, mkdirSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { makeTempDir } from './helpers'

const root = join(import.meta.dirname, '..', '..')
const tsx = join(root, 'node_modules', '.bin', 'tsx')
const started: ChildProcess[] = []
const dirs: string[] = []

afterAll(() => {
  for (const child of started) if (child.exitCode === null) child.kill('SIGTERM')
  for (const dir of dirs) rmSync(dir, { recursive: true, force: true })
})

function runServer(env: Record<string, string>, dataDir = makeTempDir()): { child: ChildProcess; output: () => string; exited: Promise<number | null> } {
  dirs.push(dataDir)
  const child = spawn(tsx, ['api/server.ts'], {
    cwd: root,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', FLEXSHELF_DATA: dataDir, FLEXSHELF_BCRYPT_COST: '10', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  started.push(child)
  let text = ''
  child.stdout!.on('data', (d) => (text += d))
  child.stderr!.on('data', (d) => (text += d))
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)))
  return { child, output: () => text, exited }
}

async function waitFor(predicate: () => boolean, timeoutMs: number): Promise<void> {
  const start = Date.now()
  while (!predicate()) {
    if (Date.now() - start > timeoutMs) throw new Error('timed out')
    await new Promise((r) => setTimeout(r, 50))
  }
}

describe('api/server.ts', () => {
  describe('in development mode', () => {
    it('seeds the demo data, listens and prints the URL', async () => {
      const server = runServer({ PORT: '0' })
      await waitFor(() => /Flexshelf is running at http:\/\/localhost:\d+/.test(server.output()), 30_000)
      const port = /localhost:(\d+)/.exec(server.output())![1]
      expect(server.output()).toMatch(/Demo data: 4 users, \d+ materials, \d+ entries(, \d+ activity records)? added/)
      const health = await fetch(`http://127.0.0.1:${port}/api/health`)
      expect(health.status).toBe(200)
      expect(await health.json()).toMatchObject({ status: 'ok', database: 'ok' })
      server.child.kill('SIGTERM')
      expect(await server.exited).toBe(0)
    })

    it('keeps the data folder private: folders 0700, database and uploads 0600, also for a folder an older version left open (issue 11)', async () => {
      // as an older version left it: 0755 folders, a 0644 upload
      const dataDir = makeTempDir()
      mkdirSync(join(dataDir, 'uploads', 'reports'), { recursive: true })
      writeFileSync(join(dataDir, 'uploads', 'reports', 'old.csv'), 'd,f\n0,0\n')
      chmodSync(dataDir, 0o755)
      chmodSync(join(dataDir, 'uploads'), 0o755)
      chmodSync(join(dataDir, 'uploads', 'reports', 'old.csv'), 0o644)
      const server = runServer({ PORT: '0' }, dataDir)
      await waitFor(() => /Flexshelf is running at/.test(server.output()), 30_000)
      const mode = (path: string) => (statSync(join(dataDir, path)).mode & 0o777).toString(8)
      expect(mode('.')).toBe('700')
      expect(mode('uploads')).toBe('700')
      expect(mode('uploads/reports')).toBe('700')
      expect(mode('uploads/reports/old.csv')).toBe('600')
      expect(mode('flexshelf.sqlite')).toBe('600')
      expect(mode('flexshelf.sqlite-wal')).toBe('600')
      expect(mode('jwt-secret')).toBe('600')
      server.child.kill('SIGTERM')
      expect(await server.exited).toBe(0)
    })
  })

  describe('in production mode without FLEXSHELF_JWT_SECRET', () => {
    it('refuses to start with a message saying what to set', async () => {
      const server = runServer({ NODE_ENV: 'production', PORT: '0' })
      expect(await server.exited).toBe(1)
      expect(server.output()).toContain('Flexshelf cannot start: FLEXSHELF_JWT_SECRET must be set in production')
    })
  })
})
