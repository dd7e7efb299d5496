import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { freePort } from '../../../scripts/support/free-port'

export interface RunningServer {
  url: string
  dataDir: string
  /** Stops the server (SIGTERM) and removes the data folder unless it was given or kept. */
  stop: () => Promise<void>
  /** Ends the process at once (SIGKILL: no shutdown, no flush); the data folder stays. */
  kill: () => Promise<void>
  /** Everything the server printed so far. */
  output: () => string
}

export interface StartOptions {
  /** Reuse this data folder (it is then never removed); a fresh temporary one otherwise. */
  dataDir?: string
  /** Keep a fresh data folder after stop (to restart on it). */
  keepData?: boolean
}


/**
 * Starts the real server (built web app + API) on a free loopback port over a fresh data folder.
 * The demo's activity (reports, e-mails, saved configurations) is off unless `env` turns it on,
 * so tests that count rows start from the demo shelf alone.
 */
export async function startServer(env: Record<string, string> = {}, options: StartOptions = {}): Promise<RunningServer> {
  const dataDir = options.dataDir ?? mkdtempSync(join(tmpdir(), 'flexshelf-e2e-'))
  const removeData = !options.dataDir && !options.keepData
  const port = await freePort()
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'api/server.ts'], {
    env: { ...process.env, NODE_ENV: 'development', PORT: String(port), HOST: '127.0.0.1', FLEXSHELF_DATA: dataDir, FLEXSHELF_DEMO_ACTIVITY: 'off', ...env },
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
  const running = () => child.exitCode === null && child.signalCode === null
  return {
    url,
    dataDir,
    output: () => output,
    stop: async () => {
      if (running()) {
        const exited = new Promise((r) => child.once('exit', r))
        child.kill('SIGTERM')
        await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))])
        if (running()) child.kill('SIGKILL')
      }
      if (removeData) rmSync(dataDir, { recursive: true, force: true })
    },
    kill: async () => {
      if (!running()) return
      const exited = new Promise((r) => child.once('exit', r))
      child.kill('SIGKILL')
      await exited
    },
  }
}
