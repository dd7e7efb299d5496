/**
 * `npm run test:pg`: the whole `api` test project against PostgreSQL. Starts a throwaway
 * cluster (scripts/support/postgres-cluster.ts), runs vitest with FLEXSHELF_TEST_DATABASE_URL
 * pointing at it (tests/api/setup-database.ts gives every test database its own PostgreSQL
 * database), then stops the cluster. Exits with vitest's exit code.
 *   npm run test:pg                         # every api test file
 *   npm run test:pg -- tests/api/seed.test.ts
 */
import { spawn } from 'node:child_process'
import { startPostgresCluster } from './support/postgres-cluster'

const cluster = await startPostgresCluster()
console.log(`PostgreSQL test cluster on 127.0.0.1:${cluster.port}`)
const stop = () => cluster.stop()
process.on('exit', stop)
for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => process.exit(130))

const child = spawn('npx', ['vitest', 'run', '--project', 'api', ...process.argv.slice(2)], {
  stdio: 'inherit',
  env: { ...process.env, FLEXSHELF_TEST_DATABASE_URL: cluster.url },
})
const code: number = await new Promise((resolve) => child.on('exit', (c, signal) => resolve(c ?? (signal ? 1 : 0))))
stop()
process.exit(code)
