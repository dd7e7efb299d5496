/**
 * The server entry: configuration from the environment, open and migrate the database,
 * seed the demo data (not in production), listen.
 */
import { createApp } from './app'
import { ConfigError, loadConfig } from './config'
import { openDatabase } from './db'
import { seedBuiltinMaterials, seedDemoData } from './db/seed'
import { demoAccountsWithPassword } from './services/admin-accounts'
import { computeBudgetMs, configureComputePool } from './services/compute-pool'
import { configureJobQueue } from './services/job-queue'
import { connectSharedState } from './services/shared-state'
import { secureDataFolder } from './services/data-folder'

/** A production server must not run with accounts whose password is printed in the README. */
async function refuseDemoAccounts(context: { config: ReturnType<typeof loadConfig>; db: Awaited<ReturnType<typeof openDatabase>> }): Promise<void> {
  const demo = await demoAccountsWithPassword(context)
  if (!demo.length) return
  await context.db.close()
  throw new ConfigError(
    `this data folder (${context.config.dataDir}) holds demo accounts with the published demo password (${demo.map((u) => u.email).join(', ')}). `
    + 'Remove them with `NODE_ENV=production FLEXSHELF_DATA=<this folder> npm run --silent admin -- remove-demo`, '
    + 'or start production on a new, empty data folder and add the first admin with `npm run --silent admin -- add --role admin …` (README, "Production")',
  )
}

async function main(): Promise<void> {
  // everything the server creates from here on is private to its user (0600 files, 0700 folders)
  process.umask(0o077)
  const config = loadConfig()
  secureDataFolder(config)
  const db = await openDatabase(config.databaseUrl ?? config.databaseFile)
  // a database created just now: SQLite honours the umask, this covers an older 0644 one too
  secureDataFolder(config)
  const context = { config, db }

  if (config.seedDemo) {
    const report = await seedDemoData(context, { activity: config.demoActivity })
    console.log(`Demo data: ${report.usersCreated} users, ${report.materialsCreated} materials, ${report.entriesCreated} entries, ${report.activityCreated} activity records added`)
    for (const s of report.skipped) console.warn(`Demo entry "${s.name}" (${s.familyId}) not seeded: ${s.reason}`)
    if (report.familiesPending.length) console.log(`Demo entries waiting for families: ${report.familiesPending.join(', ')}`)
  } else {
    await seedBuiltinMaterials(context)
  }
  if (config.production) await refuseDemoAccounts(context)

  // several instances: shared state and the job queue on Redis; the API then runs no heavy work itself
  const shared = config.redisUrl ? await connectSharedState(context, config.redisUrl) : null
  if (config.redisUrl) await configureJobQueue(config.redisUrl, computeBudgetMs)
  else if (config.databaseUrl) console.warn('FLEXSHELF_DATABASE_URL is set without FLEXSHELF_REDIS_URL: run one instance only (caches, rate limits and sign-in delays are per process)')
  await configureComputePool({ threads: config.redisUrl ? 0 : config.computeThreads, passwordThreads: config.computeThreads > 0 ? 1 : 0, budgetMs: config.computeBudgetMs })
  const app = createApp(context)
  const server = app.listen(config.port, () => {
    const address = server.address()
    const port = typeof address === 'object' && address ? address.port : config.port
    console.log(`Flexshelf is running at http://localhost:${port}`)
  })
  server.on('error', (err) => {
    console.error(`Flexshelf could not listen on port ${config.port}: ${err.message}`)
    process.exit(1)
  })

  const shutdown = () => {
    server.close(() => {
      Promise.allSettled([configureComputePool({ threads: 0 }), configureJobQueue(null, computeBudgetMs), shared?.close(), db.close()]).finally(() => process.exit(0))
    })
  }
  process.on('SIGINT', shutdown)
  process.on('SIGTERM', shutdown)
}

main().catch((err) => {
  if (err instanceof ConfigError) console.error(`Flexshelf cannot start: ${err.message}`)
  else console.error('Flexshelf cannot start:', err)
  process.exit(1)
})
