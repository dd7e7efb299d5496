/**
 * `npm run backup` against a running server, and the restore of README.md ("Backup and
 * restore") into a fresh folder: the restored server has the account, the saved
 * configuration and the uploaded test-report file, and nothing written after the backup.
 */
import { spawnSync } from 'node:child_process'
import { copyFileSync, cpSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { startServer, type RunningServer } from '../e2e/support/server'
import { apiSignIn } from '../e2e/support/views'

const ENV = { FLEXSHELF_BCRYPT_COST: '10' }
const CSV = 'displacement,force\n0,0\n0.5,0.8\n1,1.5\n1.5,2.1\n2,2.6\n2.5,2.9\n'

const servers: RunningServer[] = []
const folders: string[] = []
afterAll(async () => {
  for (const s of servers) await s.stop()
  for (const d of folders) rmSync(d, { recursive: true, force: true })
})

async function json<T>(res: Response): Promise<T> {
  if (!res.ok) throw new Error(`${res.url} answered ${res.status}: ${await res.text()}`)
  return (await res.json()) as T
}

describe('npm run backup, then a restore into a fresh folder', () => {
  it('gives a server with every record and upload of the moment of the backup', async () => {
    const live = await startServer(ENV, { keepData: true })
    servers.push(live)
    folders.push(live.dataDir)
    const account = { email: 'backed.up@example.test', password: 'kept in the backup', displayName: 'Bea Kapp' }
    await json(await fetch(`${live.url}/api/auth/signup`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(account) }))
    const token = await apiSignIn(live.url, account.email, account.password)
    const auth = { authorization: `Bearer ${token}` }
    const { entries } = await json<{ entries: Array<{ id: number; familyId: string; status: string }> }>(await fetch(`${live.url}/api/entries`, { headers: auth }))
    const entryId = entries.find((e) => e.status === 'released' && e.familyId === 'snap-hook')!.id
    const saved = await json<{ configuration: { id: number } }>(await fetch(`${live.url}/api/configurations`, {
      method: 'POST', headers: { ...auth, 'content-type': 'application/json' }, body: JSON.stringify({ entryId, name: 'Lid latch, kept', params: {} }),
    }))
    const contributor = await apiSignIn(live.url, 'contributor@demo.flexshelf.test')
    const form = new FormData()
    form.set('printer', 'Bench printer 4')
    form.set('material', 'PETG')
    form.set('file', new Blob([CSV], { type: 'text/csv' }), 'run.csv')
    const report = await json<{ report: { id: number } }>(await fetch(`${live.url}/api/entries/${entryId}/reports`, { method: 'POST', headers: { authorization: `Bearer ${contributor}` }, body: form }))

    // the backup runs beside the live server, as the command line would
    const run = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/backup.ts'], { env: { ...process.env, FLEXSHELF_DATA: live.dataDir }, encoding: 'utf8' })
    expect(run.stderr).toBe('')
    expect(run.status).toBe(0)
    expect(run.stdout).toMatch(/Database backed up to .*flexshelf-\d{4}-\d\d-\d\dT[\d-]+Z\.sqlite \(integrity check ok\)/)
    const backups = join(live.dataDir, 'backups')
    const copy = readdirSync(backups).find((n) => n.endsWith('.sqlite'))!
    const uploads = readdirSync(backups).find((n) => n.endsWith('-uploads'))!
    expect(uploads).toBe(copy.replace(/\.sqlite$/, '-uploads'))

    // written after the backup: must not be in the restored copy
    await json(await fetch(`${live.url}/api/configurations`, {
      method: 'POST', headers: { ...auth, 'content-type': 'application/json' }, body: JSON.stringify({ entryId, name: 'After the backup', params: {} }),
    }))

    // README: stop the server, copy the backup to <data>/flexshelf.sqlite and its uploads to <data>/uploads
    const fresh = mkdtempSync(join(tmpdir(), 'flexshelf-restore-'))
    folders.push(fresh)
    copyFileSync(join(backups, copy), join(fresh, 'flexshelf.sqlite'))
    cpSync(join(backups, uploads), join(fresh, 'uploads'), { recursive: true })
    expect(existsSync(join(fresh, 'flexshelf.sqlite-wal'))).toBe(false)

    const restored = await startServer(ENV, { dataDir: fresh })
    servers.push(restored)
    const token2 = await apiSignIn(restored.url, account.email, account.password)
    const listed = await json<{ configurations: Array<{ id: number; name: string }> }>(await fetch(`${restored.url}/api/configurations`, { headers: { authorization: `Bearer ${token2}` } }))
    expect(listed.configurations.map((c) => c.name)).toEqual(['Lid latch, kept'])
    expect(listed.configurations[0].id).toBe(saved.configuration.id)
    const contributor2 = await apiSignIn(restored.url, 'contributor@demo.flexshelf.test')
    const file = await fetch(`${restored.url}/api/reports/${report.report.id}/file`, { headers: { authorization: `Bearer ${contributor2}` } })
    expect(file.status).toBe(200)
    expect(await file.text()).toBe(CSV)
  })
})

describe('npm run backup without a database', () => {
  it('exits non-zero saying where it looked', () => {
    const empty = mkdtempSync(join(tmpdir(), 'flexshelf-nodb-'))
    folders.push(empty)
    const run = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/backup.ts'], { env: { ...process.env, FLEXSHELF_DATA: empty }, encoding: 'utf8' })
    expect(run.status).toBe(1)
    expect(run.stderr).toContain(`Backup failed: no database at ${join(empty, 'flexshelf.sqlite')}`)
  })
})
