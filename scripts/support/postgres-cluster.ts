/**
 * A throwaway PostgreSQL cluster from Debian's binaries (initdb, pg_ctl): a temporary folder,
 * a free loopback port, trust authentication for loopback only, fsync off (nothing in it
 * outlives the run). initdb refuses to run as root, so as root the cluster belongs to the
 * `postgres` user and every binary runs through runuser. Used by `npm run test:pg` and the
 * several-instance arrangement test; stop() removes everything.
 */
import { execFileSync } from 'node:child_process'
import { chmodSync, chownSync, existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { freePort } from './free-port'

const POSTGRES_BIN = process.env.FLEXSHELF_PG_BIN || '/usr/lib/postgresql/15/bin'

export interface PostgresCluster {
  port: number
  /** postgres://postgres@127.0.0.1:<port>/postgres — the superuser's own database. */
  url: string
  /** The URL of another database on the same cluster. */
  urlOf(database: string): string
  stop(): void
}

function postgresIds(): { uid: number; gid: number } {
  const uid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim())
  const gid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim())
  return { uid, gid }
}

export async function startPostgresCluster(): Promise<PostgresCluster> {
  if (!existsSync(join(POSTGRES_BIN, 'initdb'))) {
    throw new Error(`PostgreSQL binaries not found in ${POSTGRES_BIN} (apt-get install postgresql, or set FLEXSHELF_PG_BIN)`)
  }
  const root = process.getuid?.() === 0
  const dir = mkdtempSync(join(tmpdir(), 'flexshelf-pg-'))
  if (root) {
    const { uid, gid } = postgresIds()
    chownSync(dir, uid, gid)
  }
  chmodSync(dir, 0o700)
  const data = join(dir, 'data')
  const run = (binary: string, args: string[]) => {
    const [file, argv] = root ? ['runuser', ['-u', 'postgres', '--', join(POSTGRES_BIN, binary), ...args]] : [join(POSTGRES_BIN, binary), args]
    execFileSync(file, argv, { stdio: ['ignore', 'pipe', 'pipe'], cwd: dir })
  }
  run('initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync'])
  const port = await freePort()
  const settings = [
    `-p ${port}`, '-c listen_addresses=127.0.0.1', `-c unix_socket_directories=${dir}`,
    '-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off', '-c max_connections=300',
  ].join(' ')
  run('pg_ctl', ['-D', data, '-o', settings, '-l', join(dir, 'server.log'), '-w', '-t', '60', 'start'])
  let stopped = false
  const url = `postgres://postgres@127.0.0.1:${port}/postgres`
  return {
    port,
    url,
    urlOf: (database) => `postgres://postgres@127.0.0.1:${port}/${database}`,
    stop() {
      if (stopped) return
      stopped = true
      try {
        run('pg_ctl', ['-D', data, '-m', 'immediate', '-w', 'stop'])
      } finally {
        rmSync(dir, { recursive: true, force: true })
      }
    },
  }
}
