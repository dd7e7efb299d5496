/**
 * The job queue on Redis (BullMQ) that several API instances share with `npm run worker`
 * processes on any machine, when FLEXSHELF_REDIS_URL is set. Without it, heavy work runs on
 * the process's own compute pool and search threads as before.
 *
 * Two queues:
 * - `flexshelf-compute`: evaluations, checks with bands, data sheets, STL and the other part
 *   files (api/services/compute/tasks.ts, the same tasks the pool runs);
 * - `flexshelf-search`: searches, with progress (job.updateProgress, seen by every instance
 *   through QueueEvents) and cancel (a Redis message the worker running it acts on).
 *
 * Deadlines: a job no worker has picked up within the compute budget is taken back off the
 * queue and answered 503 busy (the API never runs it itself); once picked up, the worker runs
 * it under the same budget as the pool (422 compute_budget_exceeded). A worker that dies with a
 * job stops renewing the job's lock; after the lock runs out another worker's stalled-job check
 * puts it back in the queue and it runs again, so the request still gets its one answer.
 * Answers travel as data (an outcome, never a thrown error), so an answer is the job's return value.
 */
import { randomUUID } from 'node:crypto'
import { Queue, QueueEvents, type Job } from 'bullmq'
import type { Redis } from 'ioredis'
import type { SearchAnswer, SearchProgress } from '../../catalog'
import { SearchCancelledError } from '../../catalog'
import { HttpError } from '../errors'
import { ComputeBudgetExceededError, ComputeBusyError, type ComputeAsk } from './compute/budget'
import { fromFailure, type ComputeFailure, type ComputeTask } from './compute/tasks'
import type { SearchTask } from './search/protocol'
import { Gauge } from 'prom-client'
import { metricsRegistry } from './metrics'
import { connectRedis } from './redis'

export const COMPUTE_QUEUE = 'flexshelf-compute'
export const SEARCH_QUEUE = 'flexshelf-search'
export const SEARCH_CANCEL_CHANNEL = 'flexshelf:search-cancel'
/** Set (with an expiry) when a search is cancelled, so a worker picking the job up later does not run it. */
export const searchCancelledKey = (jobId: string) => `flexshelf:search-cancelled:${jobId}`

/** A value as JSON: bytes (STL, 3MF) travel as base64. */
export type EncodedValue = unknown
export type QueuedOutcome =
  | { ok: true; value: EncodedValue }
  | { ok: false; error: ComputeFailure }
  | { ok: false; http: { status: number; code: string; message: string; details: Record<string, unknown> | null } }
  | { ok: false; cancelled: true }

export interface ComputeJobData {
  task: ComputeTask
  ask: ComputeAsk
  /** ms since the epoch: a worker picking the job up later than this (first start) answers busy. */
  pickUpBy: number
}

export interface SearchJobData {
  task: SearchTask
  ask?: ComputeAsk
  pickUpBy: number
}

export function encodeValue(value: unknown): EncodedValue {
  if (value instanceof Uint8Array) return { $bytes: Buffer.from(value.buffer, value.byteOffset, value.byteLength).toString('base64') }
  return value
}

function decodeValue(value: EncodedValue): unknown {
  if (value && typeof value === 'object' && '$bytes' in value) return new Uint8Array(Buffer.from((value as { $bytes: string }).$bytes, 'base64'))
  return value
}

/** The outcome of running something, as data for the job's return value. */
export function outcomeOfError(err: unknown, toFailure: (e: unknown) => ComputeFailure): QueuedOutcome {
  if (err instanceof SearchCancelledError) return { ok: false, cancelled: true }
  if (err instanceof HttpError) return { ok: false, http: { status: err.status, code: err.code, message: err.message, details: err.details } }
  return { ok: false, error: toFailure(err) }
}

function errorOfOutcome(outcome: Exclude<QueuedOutcome, { ok: true }>, ask: ComputeAsk | undefined): Error {
  if ('cancelled' in outcome) return new SearchCancelledError()
  if ('http' in outcome) {
    const { status, code, message, details } = outcome.http
    if (code === 'compute_budget_exceeded' && ask) return new ComputeBudgetExceededError(ask, Number(details?.budgetMs))
    if (code === 'busy') return new ComputeBusyError(ask?.what ?? 'the computation')
    return new HttpError(status, code, message, details)
  }
  return fromFailure(outcome.error)
}

interface Connection {
  compute: Queue<ComputeJobData, QueuedOutcome>
  search: Queue<SearchJobData, QueuedOutcome>
  computeEvents: QueueEvents
  searchEvents: QueueEvents
  redis: Redis
  url: string
  budgetMs: () => number
}

let connection: Connection | null = null

const JOB_STATES = ['waiting', 'active', 'failed', 'delayed'] as const
const QUEUE_JOBS_METRIC = 'flexshelf_queue_jobs'
const QUEUE_WORKERS_METRIC = 'flexshelf_queue_workers'

/**
 * The queues' gauges in /metrics, read from Redis at each scrape, so every instance reports the
 * same shared numbers. Registered only while the queue is configured: a single process has no
 * queue and shows none (its compute pool has flexshelf_compute_queue_depth).
 */
function registerQueueGauges(c: Connection): void {
  unregisterQueueGauges()
  const queues = [c.compute, c.search]
  new Gauge({
    name: QUEUE_JOBS_METRIC,
    help: 'Jobs on the shared Redis queues by queue and state (waiting includes prioritized), read from Redis at scrape time',
    labelNames: ['queue', 'state'] as const,
    registers: [metricsRegistry],
    async collect() {
      const counts = await Promise.all(queues.map((q) => q.getJobCounts(...JOB_STATES, 'prioritized')))
      queues.forEach((q, i) => {
        for (const state of JOB_STATES) this.set({ queue: q.name, state }, (counts[i][state] ?? 0) + (state === 'waiting' ? counts[i].prioritized ?? 0 : 0))
      })
    },
  })
  new Gauge({
    name: QUEUE_WORKERS_METRIC,
    help: 'Worker processes (npm run worker) connected to each queue now, from Redis\'s client list',
    labelNames: ['queue'] as const,
    registers: [metricsRegistry],
    async collect() {
      const counts = await Promise.all(queues.map((q) => q.getWorkersCount()))
      queues.forEach((q, i) => this.set({ queue: q.name }, counts[i]))
    },
  })
}

function unregisterQueueGauges(): void {
  metricsRegistry.removeSingleMetric(QUEUE_JOBS_METRIC)
  metricsRegistry.removeSingleMetric(QUEUE_WORKERS_METRIC)
}

export const jobQueueActive = () => connection !== null

/** Connects this API process to the queues (redisUrl) or back to in-process work (null). */
export async function configureJobQueue(redisUrl: string | null, budgetMs: () => number): Promise<void> {
  const old = connection
  connection = null
  unregisterQueueGauges()
  if (old) {
    await Promise.allSettled([old.compute.close(), old.search.close(), old.computeEvents.close(), old.searchEvents.close()])
    await old.redis.quit().catch(() => undefined)
  }
  if (!redisUrl) return
  const redis = connectRedis(redisUrl, 'queue')
  const next: Connection = {
    compute: new Queue(COMPUTE_QUEUE, { connection: redis }),
    search: new Queue(SEARCH_QUEUE, { connection: redis }),
    computeEvents: new QueueEvents(COMPUTE_QUEUE, { connection: connectRedis(redisUrl, 'compute-events') }),
    searchEvents: new QueueEvents(SEARCH_QUEUE, { connection: connectRedis(redisUrl, 'search-events') }),
    redis,
    url: redisUrl,
    budgetMs,
  }
  await Promise.all([next.computeEvents.waitUntilReady(), next.searchEvents.waitUntilReady()])
  connection = next
  registerQueueGauges(next)
}

/** How long the API waits for a picked-up job at most: its budget, two stalled-job recoveries and their re-runs. */
export const answerWaitMs = (budgetMs: number) => budgetMs * 3 + 60_000

/** The queue's Redis and settings, for state kept beside the queue (the search job registry); null without Redis. */
export function jobQueueRedis(): { redis: Redis; url: string; budgetMs: number } | null {
  return connection ? { redis: connection.redis, url: connection.url, budgetMs: connection.budgetMs() } : null
}

/**
 * Cancels a queued search from any instance: the worker running it stops (a message every
 * worker hears), and a worker that picks it up later finds the mark and does not run it.
 */
export async function cancelQueuedSearch(jobId: string): Promise<void> {
  const c = connection
  if (!c) return
  await c.redis.set(searchCancelledKey(jobId), '1', 'PX', answerWaitMs(c.budgetMs()))
  await c.redis.publish(SEARCH_CANCEL_CHANNEL, jobId)
}

/**
 * Waits for a job's answer. At the pick-up deadline a job still waiting is taken off the
 * queue (busy); a job a worker holds, or that stalled and waits to run again, is waited for.
 */
async function answerOf<D>(job: Job<D, QueuedOutcome>, events: QueueEvents, budgetMs: number, what: string): Promise<QueuedOutcome> {
  let deadline: NodeJS.Timeout | undefined
  const unpicked = new Promise<never>((_, reject) => {
    deadline = setTimeout(async () => {
      try {
        const state = await job.getState()
        if (state === 'waiting' || state === 'prioritized' || state === 'delayed') {
          // remove() fails on a job a worker has just locked: that one is waited for
          await job.remove()
          reject(new ComputeBusyError(`${what} (no worker picked it up in time)`))
        }
      } catch {
        // picked up in the meantime
      }
    }, budgetMs)
  })
  try {
    return await Promise.race([job.waitUntilFinished(events, answerWaitMs(budgetMs)) as Promise<QueuedOutcome>, unpicked])
  } finally {
    clearTimeout(deadline)
  }
}

/** Runs a compute task on a worker; the same answers and errors as the in-process pool. */
export async function runQueued(task: ComputeTask, ask: ComputeAsk, budgetMs: number): Promise<unknown> {
  const c = connection
  if (!c) throw new Error('the job queue is not configured')
  const job = await c.compute.add(task.kind, { task, ask, pickUpBy: Date.now() + budgetMs }, {
    jobId: randomUUID(), removeOnComplete: { age: 300 }, removeOnFail: { age: 3600 },
  })
  const outcome = await answerOf(job, c.computeEvents, budgetMs, ask.what)
  if (outcome.ok) return decodeValue(outcome.value)
  throw errorOfOutcome(outcome, ask)
}

export interface QueuedSearchOptions {
  onProgress?: (progress: SearchProgress) => void
  signal?: AbortSignal
  budgetMs?: number
  ask?: ComputeAsk
  /** The job's id on the queue: the search job's own id, so any instance can cancel it by that id. */
  jobId?: string
}

/** SearchPool's run() over the queue: progress from whichever worker runs it, cancel reaches that worker. */
export const queuedSearchPool = {
  async run(task: SearchTask, options: QueuedSearchOptions = {}): Promise<SearchAnswer> {
    const c = connection
    if (!c) throw new Error('the job queue is not configured')
    if (options.signal?.aborted) throw new SearchCancelledError()
    const budgetMs = options.budgetMs ?? c.budgetMs()
    const jobId = options.jobId ?? randomUUID()
    const onProgress = ({ jobId: id, data }: { jobId: string; data: unknown }) => {
      if (id === jobId && data && typeof data === 'object') options.onProgress?.(data as SearchProgress)
    }
    const cancel = () => void cancelQueuedSearch(jobId).catch(() => undefined)
    c.searchEvents.on('progress', onProgress)
    options.signal?.addEventListener('abort', cancel, { once: true })
    try {
      const job = await c.search.add('search', { task, ask: options.ask, pickUpBy: Date.now() + budgetMs }, {
        jobId, removeOnComplete: { age: 300 }, removeOnFail: { age: 3600 },
      })
      const outcome = await answerOf(job, c.searchEvents, budgetMs, options.ask?.what ?? 'the search')
      if (outcome.ok) return outcome.value as SearchAnswer
      throw errorOfOutcome(outcome, options.ask)
    } finally {
      c.searchEvents.off('progress', onProgress)
      options.signal?.removeEventListener('abort', cancel)
    }
  },
}

/** Jobs waiting and running now (the queue check of /api/ready and /metrics read it). */
export async function queueCounts(): Promise<{ waiting: number; active: number } | null> {
  const c = connection
  if (!c) return null
  const [compute, search] = await Promise.all([c.compute.getJobCounts('waiting', 'active', 'prioritized'), c.search.getJobCounts('waiting', 'active', 'prioritized')])
  return {
    waiting: (compute.waiting ?? 0) + (compute.prioritized ?? 0) + (search.waiting ?? 0) + (search.prioritized ?? 0),
    active: (compute.active ?? 0) + (search.active ?? 0),
  }
}
