import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

export interface RunningServer {
  url: string
  dataDir: string
  stop: () => Promise<void>
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer()
    srv.unref()
    srv.on('error', reject)
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address()
      const port = typeof address === 'object' && address ? address.port : 0
      srv.close(() => resolve(port))
    })
  })
}

/** Starts the real server (built web app + API) on a free loopback port over a fresh data folder. */
export async function startServer(env: Record<string, string> = {}): Promise<RunningServer> {
  const dataDir = mkdtempSync(join(tmpdir(), 'flexshelf-e2e-'))
  const port = await freePort()
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'api/server.ts'], {
    env: { ...process.env, NODE_ENV: 'development', PORT: String(port), HOST: '127.0.0.1', FLEXSHELF_DATA: dataDir, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let output = ''
  child.stdout?.on('data', (d) => { output += String(d) })
  child.stderr?.on('data', (d) => { output += String(d) })
  const url = `http://127.0.0.1:${port}`
  const deadline = Date.now() + 90_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited early (${child.exitCode}):\n${output}`)
    try {
      const res = await fetch(`${url}/api/health`)
      if (res.ok) break
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL')
      throw new Error(`server did not answer /api/health within 90 s:\n${output}`)
    }
    await new Promise((r) => setTimeout(r, 250))
  }
  return {
    url,
    dataDir,
    stop: async () => {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r))
        child.kill('SIGTERM')
        await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))])
        if (child.exitCode === null) child.kill('SIGKILL')
      }
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
