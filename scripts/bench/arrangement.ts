/**
 * `npm run bench:load -- --arrangement`: the several-instance arrangement on loopback
 * (scripts/support/arrangement.ts: PostgreSQL, Redis, the S3 fake as processes) with one and
 * two API instances and one and two workers (one job at a time each). Per layout: shelf-list
 * throughput at 50 connections spread over the instances, and evaluation throughput with 8
 * connections (every evaluation through the queue to a worker); then the time of one
 * evaluation alone, which the README's projection for a larger site uses. Reports, asserts nothing.
 */
import { availableParallelism } from 'node:os'
import autocannon, { type Result } from 'autocannon'
import { DEMO_PASSWORD, DEMO_USERS } from '../../api/db/demo-shelf'
import { api, startArrangement, type Proc } from '../support/arrangement'

const duration = Number(process.argv[process.argv.indexOf('--duration') + 1]) || 5

function drive(urls: string[], connections: number, path: string, token: string, body?: unknown): Promise<Result[]> {
  const per = Math.max(1, Math.round(connections / urls.length))
  return Promise.all(urls.map((url) => autocannon({
    url: `${url}${path}`, connections: per, duration, timeout: 60,
    method: body ? 'POST' : 'GET',
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: body ? JSON.stringify(body) : undefined,
  })))
}

const sum = (rs: Result[]) => ({
  rps: Math.round(rs.reduce((n, r) => n + r.requests.average, 0)),
  p99: Math.max(...rs.map((r) => r.latency.p99)),
  errors: rs.reduce((n, r) => n + r.errors + r.non2xx, 0),
})

async function main(): Promise<void> {
  const a = await startArrangement()
  const rows: string[] = []
  try {
    let apis: Proc[] = await Promise.all([a.startApi('api-1'), a.startApi('api-2')])
    const engineer = DEMO_USERS.find((u) => u.role === 'engineer')!.email
    const token = (await api(apis[0].url!, '/api/auth/signin', null, { body: { email: engineer, password: DEMO_PASSWORD } })).body.token as string
    const evaluation = { params: { material: 'petg' } }
    const path = '/api/families/bistable-beam/evaluate'
    let workers: Proc[] = [await a.startWorker('worker-1'), await a.startWorker('worker-2')]

    // one evaluation alone, through the queue (warm: the first ones start the threads)
    for (let i = 0; i < 3; i++) await api(apis[0].url!, path, token, { body: evaluation })
    const times: number[] = []
    for (let i = 0; i < 10; i++) {
      const t0 = performance.now()
      await api(apis[0].url!, path, token, { body: evaluation })
      times.push(performance.now() - t0)
    }
    times.sort((x, y) => x - y)
    const single = times[5]

    for (const [nApi, nWorker] of [[1, 1], [2, 1], [1, 2], [2, 2]]) {
      const urls = apis.slice(0, nApi).map((p) => p.url!)
      // stop the workers not in this layout, start back those that are
      while (workers.length > nWorker) await a.kill(workers.pop()!, 'SIGTERM')
      while (workers.length < nWorker) workers.push(await a.startWorker(`worker-${workers.length + 1}-again`))
      const shelf = sum(await drive(urls, 50, '/api/shelf', token))
      const evaluations = sum(await drive(urls, 8, path, token, evaluation))
      rows.push(`| ${nApi} | ${nWorker} | ${shelf.rps} | ${shelf.p99} | ${shelf.errors} | ${evaluations.rps} | ${evaluations.p99} | ${evaluations.errors} |`)
      console.error(`layout ${nApi} instance(s), ${nWorker} worker(s) done`)
    }
    apis = []
    console.log(`\nFlexshelf arrangement benchmark: ${duration} s per scenario, loopback, ${availableParallelism()} cores shared by PostgreSQL, Redis, the instances, the workers and autocannon, Node ${process.version}\n`)
    console.log('| instances | workers | shelf list req/s | p99 ms | errors | evaluations/s | p99 ms | errors |')
    console.log('| --- | --- | --- | --- | --- | --- | --- | --- |')
    for (const r of rows) console.log(r)
    console.log(`\nOne evaluation alone through the queue (median of 10): ${single.toFixed(0)} ms`)
  } finally {
    await a.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
