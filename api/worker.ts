/**
 * `npm run worker`: a process that runs the job queue's work (api/services/job-queue.ts) for
 * every API instance with the same FLEXSHELF_REDIS_URL, on this machine or any other. Jobs run on
 * its own compute threads and search threads under the same compute budget as in the API.
 *
 * FLEXSHELF_WORKER_CONCURRENCY jobs of each queue at a time (default: the machine's cores);
 * FLEXSHELF_QUEUE_LOCK_MS how long a job's lock lasts without renewal, so how soon the job of a
 * worker that died runs again elsewhere (default 10 s). SIGTERM / SIGINT: finish running jobs, stop.
 */
import { availableParallelism } from 'node:os'
import { Worker, type Job } from 'bullmq'
import { SearchCancelledError, type SearchProgress } from '../catalog'
import { ConfigError, loadConfig } from './config'
import { ComputeBusyError } from './services/compute/budget'
import { toFailure } from './services/compute/tasks'
import { configureComputePool, runHere } from './services/compute-pool'
import {
  COMPUTE_QUEUE, encodeValue, outcomeOfError, SEARCH_CANCEL_CHANNEL, SEARCH_QUEUE, searchCancelledKey,
  type ComputeJobData, type QueuedOutcome, type SearchJobData,
} from './services/job-queue'
import { connectRedis } from './services/redis'
import { SearchPool } from './services/search/pool'

function parseWhole(value: string | undefined, name: string, fallback: number, min: number, max: number): number {
  if (value === undefined || value === '') return fallback
  const n = Number(value)
  if (!Number.isInteger(n) || n < min || n > max) throw new ConfigError(`${name} must be a whole number from ${min} to ${max} (got "${value}")`)
  return n
}

/** Progress reaches Redis at most this often per search (a search reports far more often). */
const PROGRESS_EVERY_MS = 100

/** A job first started after its pick-up deadline was already answered busy by the API. */
const tooLate = (job: Job<{ pickUpBy: number }>) => job.attemptsStarted <= 1 && Date.now() > job.data.pickUpBy

async function main(): Promise<void> {
  const config = loadConfig()
  if (!config.redisUrl) throw new ConfigError('FLEXSHELF_REDIS_URL must be set for a worker (the Redis the API instances use)')
  const concurrency = parseWhole(process.env.FLEXSHELF_WORKER_CONCURRENCY, 'FLEXSHELF_WORKER_CONCURRENCY', availableParallelism(), 1, 64)
  const lockMs = parseWhole(process.env.FLEXSHELF_QUEUE_LOCK_MS, 'FLEXSHELF_QUEUE_LOCK_MS', 10_000, 1000, 10 * 60_000)
  await configureComputePool({ threads: concurrency, budgetMs: config.computeBudgetMs })
  const searches = new SearchPool(concurrency)
  const running = new Map<string, AbortController>()
  // a worker that died is noticed when its lock runs out; another worker checks this often
  const common = { concurrency, lockDuration: lockMs, stalledInterval: lockMs, maxStalledCount: 2 }

  const computeWorker = new Worker<ComputeJobData, QueuedOutcome>(COMPUTE_QUEUE, async (job) => {
    if (tooLate(job)) return outcomeOfError(new ComputeBusyError(job.data.ask.what), toFailure)
    try {
      return { ok: true, value: encodeValue(await runHere(job.data.task, job.data.ask)) }
    } catch (err) {
      return outcomeOfError(err, toFailure)
    }
  }, { ...common, connection: connectRedis(config.redisUrl, 'worker-compute') })

  const state = connectRedis(config.redisUrl, 'worker-state')
  const searchWorker = new Worker<SearchJobData, QueuedOutcome>(SEARCH_QUEUE, async (job) => {
    if (tooLate(job)) return outcomeOfError(new ComputeBusyError('the search'), toFailure)
    const controller = new AbortController()
    running.set(job.id!, controller)
    // cancelled while it waited in the queue (or before a stalled run came back): not run at all
    if (await state.exists(searchCancelledKey(job.id!))) {
      running.delete(job.id!)
      return outcomeOfError(new SearchCancelledError(), toFailure)
    }
    let last = 0
    const onProgress = (progress: SearchProgress) => {
      const now = Date.now()
      if (now - last < PROGRESS_EVERY_MS && progress.phase !== 'done') return
      last = now
      void job.updateProgress(progress as unknown as object).catch(() => undefined)
    }
    try {
      return { ok: true, value: await searches.run(job.data.task, { onProgress, signal: controller.signal, ask: job.data.ask, budgetMs: config.computeBudgetMs }) }
    } catch (err) {
      return outcomeOfError(err, toFailure)
    } finally {
      running.delete(job.id!)
    }
  }, { ...common, connection: connectRedis(config.redisUrl, 'worker-search') })

  const subscriber = connectRedis(config.redisUrl, 'worker-cancel')
  await subscriber.subscribe(SEARCH_CANCEL_CHANNEL)
  subscriber.on('message', (_channel: string, jobId: string) => running.get(jobId)?.abort())

  for (const w of [computeWorker, searchWorker]) w.on('error', (err) => console.error(`Flexshelf worker: ${err.message}`))
  await Promise.all([computeWorker.waitUntilReady(), searchWorker.waitUntilReady()])
  console.log(`Flexshelf worker ready: ${concurrency} jobs of each queue at a time, lock ${lockMs} ms`)

  let stopping = false
  const shutdown = () => {
    if (stopping) return
    stopping = true
    Promise.allSettled([computeWorker.close(), searchWorker.close()])
      .then(() => Promise.allSettled([subscriber.quit(), state.quit(), searches.close(), configureComputePool({ threads: 0 })]))
      .finally(() => process.exit(0))
  }
  process.on('SIGINT', shutdown)
  process.on('SIGTERM', shutdown)
}

main().catch((err) => {
  if (err instanceof ConfigError) console.error(`Flexshelf worker cannot start: ${err.message}`)
  else console.error('Flexshelf worker cannot start:', err)
  process.exit(1)
})
