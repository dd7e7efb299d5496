/**
 * Search as the API offers it: windows checked against the curated materials, answers
 * cached by window and shelf fingerprint, long searches as jobs that report progress and
 * can be cancelled. Jobs belong to the user who started them and are forgotten a while after
 * they finish; they live in memory, or in Redis beside the job queue when several instances
 * share it (jobs.ts), so any instance answers for, streams and cancels any job.
 */
import { randomUUID } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import { parseWindow, windowCacheKey, type ForceWindow, type SearchAnswer, type SearchProgress } from '../../../catalog'
import type { AppContext } from '../../context'
import { HttpError, notFound } from '../../errors'
import { toHttpError } from '../../middleware/error-handler'
import { answerWaitMs, cancelQueuedSearch, jobQueueActive, jobQueueRedis, queuedSearchPool } from '../job-queue'
import { MemorySearchJobs, RedisSearchJobs, type ApiSearchAnswer, type JobEvent, type JobStatus, type SearchJobRecord, type SearchJobRegistry } from './jobs'
import { sharedSearchPool, type RunOptions } from './pool'
import type { SearchTask } from './protocol'
import { loadShelf, type ShelfSnapshot } from './shelf'
import { tradeoffsOf } from './tradeoffs'

/** Answers kept; a window's answer is a few kilobytes. */
const CACHE_CAPACITY = 200
/** Running searches one user may have at once, over both routes (POST /api/search and jobs). */
const MAX_RUNNING_PER_USER = 3
/** A finished job is kept this long for a late or repeated events request, ms. */
const FINISHED_JOB_TTL_MS = 10 * 60_000

export type { ApiSearchAnswer, JobEvent } from './jobs'

/** What GET /api/searches/:id answers: the job's state, and its result or error once it has ended. */
export interface SearchJobView {
  id: string
  status: JobStatus
  cached: boolean
  progress: SearchProgress | null
  result: (ApiSearchAnswer & { cached: boolean }) | null
  error: { code: string; message: string; details: Record<string, unknown> | null } | null
}

export interface SearchOutcome {
  answer: ApiSearchAnswer
  cached: boolean
}

type SearchRunner = { run(task: SearchTask, options: RunOptions & { jobId?: string }): Promise<SearchAnswer> }

export class SearchService {
  private readonly cache = new LRUCache<string, ApiSearchAnswer>({ max: CACHE_CAPACITY })
  private cacheVersion = ''
  /** Jobs started by this process and still running here, to stop them when cancelled. */
  private readonly controllers = new Map<string, AbortController>()
  /** Cache hits and misses since start (tests and the bench read them). */
  readonly stats = { hits: 0, misses: 0 }

  constructor(
    private readonly context: AppContext,
    private readonly pool: SearchRunner = jobQueueActive() ? queuedSearchPool : sharedSearchPool(),
    private readonly jobs: SearchJobRegistry = defaultRegistry(),
  ) {}

  /** Checks the window (400 naming the field) and loads the shelf it is searched over. */
  private async prepare(body: unknown): Promise<{ window: ForceWindow; shelf: ShelfSnapshot; key: string }> {
    const shelf = await loadShelf(this.context)
    const window = parseWindow(body, { materialIds: shelf.materials.map((m) => m.id) })
    // a changed shelf (status, ranges, revision, material numbers) retires every cached answer
    if (shelf.version !== this.cacheVersion) {
      this.cache.clear()
      this.cacheVersion = shelf.version
    }
    return { window, shelf, key: windowCacheKey(window) }
  }

  private async compute(window: ForceWindow, shelf: ShelfSnapshot, key: string, onProgress?: (p: SearchProgress) => void, signal?: AbortSignal, jobId?: string): Promise<ApiSearchAnswer> {
    const found = await this.pool.run({ window, shelf: shelf.entries, materials: shelf.materials, shelfVersion: shelf.version }, { onProgress, signal, jobId })
    const answer = { ...found, tradeoffs: tradeoffsOf(found) }
    if (this.cacheVersion === shelf.version) this.cache.set(key, answer)
    return answer
  }

  /**
   * Searches of one user being computed now, over both routes (and every instance). A job the
   * user has cancelled no longer counts, though its thread may take a moment to stop: "cancel
   * one" frees a place at once, as the 429's message promises.
   */
  running(ownerId: number): Promise<number> {
    return this.jobs.running(ownerId)
  }

  /** Takes one of the user's MAX_RUNNING_PER_USER places, whichever route starts the search; 429 when none is free. */
  private async takePlace(ownerId: number, member: string) {
    const { taken, running } = await this.jobs.reserve(ownerId, member, MAX_RUNNING_PER_USER)
    if (!taken) {
      throw new HttpError(429, 'rate_limited', `you already have ${running} searches running; cancel one or wait for it to finish`, { retryAfterSeconds: 1 })
    }
  }

  /** One search to the end (POST /api/search); `signal` cancels it when the caller leaves. */
  async search(ownerId: number, body: unknown, signal?: AbortSignal): Promise<SearchOutcome> {
    const { window, shelf, key } = await this.prepare(body)
    const hit = this.cache.get(key)
    if (hit) { this.stats.hits++; return { answer: hit, cached: true } }
    const place = `direct:${randomUUID()}`
    await this.takePlace(ownerId, place)
    this.stats.misses++
    try {
      return { answer: await this.compute(window, shelf, key, undefined, signal), cached: false }
    } finally {
      await this.jobs.release(ownerId, place).catch(() => undefined)
    }
  }

  /** Starts a search job (POST /api/searches). */
  async start(ownerId: number, body: unknown): Promise<SearchJobRecord> {
    const { window, shelf, key } = await this.prepare(body)
    const id = randomUUID()
    await this.takePlace(ownerId, id)
    const hit = this.cache.get(key)
    if (hit) {
      this.stats.hits++
      const done: SearchJobRecord = {
        id, ownerId, status: 'done', cached: true, progress: { done: 1, total: 1, considered: hit.considered, phase: 'done' },
        final: { event: 'result', data: { ...hit, cached: true } }, finishedAt: Date.now(),
      }
      try {
        await this.jobs.create(done)
      } finally {
        await this.jobs.release(ownerId, id)
      }
      return done
    }
    this.stats.misses++
    const job: SearchJobRecord = { id, ownerId, status: 'running', cached: false, progress: null, final: null, finishedAt: null }
    try {
      await this.jobs.create(job)
    } catch (err) {
      await this.jobs.release(ownerId, id).catch(() => undefined)
      throw err
    }
    const controller = new AbortController()
    this.controllers.set(id, controller)
    // a cancel on another instance ends the job there: stop the search this one is waiting for
    const stopWatching = this.jobs.follow(id, (event) => { if (event.event === 'cancelled') controller.abort() }).catch(() => () => undefined)
    const end = async (status: Exclude<JobStatus, 'running'>, event: JobEvent) => {
      this.controllers.delete(id)
      ;(await stopWatching)()
      await this.jobs.finish(id, status, event).catch((err: unknown) => console.error(err))
      await this.jobs.release(ownerId, id).catch(() => undefined)
    }
    const onProgress = (progress: SearchProgress) => void this.jobs.progress(id, progress).catch(() => undefined)
    this.compute(window, shelf, key, onProgress, controller.signal, id).then(
      (answer) => end('done', { event: 'result', data: { ...answer, cached: false } }),
      (e: Error) => {
        if (e.name === 'AbortError') return end('cancelled', { event: 'cancelled', data: { id } })
        const http = toHttpError(e)
        if (http.status >= 500) console.error(e)
        return end('failed', { event: 'error', data: { error: { code: http.code, message: http.message, details: http.details } } })
      },
    )
    return job
  }

  /** The caller's own job, from whichever instance started it; anyone else's is not found (its id says nothing about it). */
  async job(ownerId: number, id: string): Promise<SearchJobRecord> {
    const job = await this.jobs.get(id)
    if (!job || job.ownerId !== ownerId) throw notFound('search')
    return job
  }

  /** The job as GET /api/searches/:id answers it. */
  view(job: SearchJobRecord): SearchJobView {
    const final = job.final
    return {
      id: job.id, status: job.status, cached: job.cached, progress: job.progress,
      result: final?.event === 'result' ? final.data : null,
      error: final?.event === 'error' ? final.data.error : null,
    }
  }

  /**
   * Follows a job: the latest progress and, once it has ended, its final event are replayed
   * first, so a late listener misses nothing. Answers the unsubscribe function.
   */
  follow(job: SearchJobRecord, listener: (event: JobEvent) => void): Promise<() => void> {
    return this.jobs.follow(job.id, listener)
  }

  /**
   * Cancels a running job (it stays, so followers see `cancelled`, on every instance, at once);
   * forgets an ended one. A search started here is stopped here; one started elsewhere is
   * stopped on its worker (one that has not picked it up yet never runs it), and the instance
   * that started it hears the cancelled event and stops waiting for it.
   */
  async cancel(job: SearchJobRecord): Promise<void> {
    if (job.status !== 'running') return this.jobs.forget(job.id)
    await this.jobs.release(job.ownerId, job.id)
    this.controllers.get(job.id)?.abort()
    if (jobQueueActive()) await cancelQueuedSearch(job.id)
    await this.jobs.finish(job.id, 'cancelled', { event: 'cancelled', data: { id: job.id } })
  }
}

function defaultRegistry(): SearchJobRegistry {
  const shared = jobQueueRedis()
  if (!shared) return new MemorySearchJobs(FINISHED_JOB_TTL_MS)
  return new RedisSearchJobs(shared.redis, shared.url, FINISHED_JOB_TTL_MS, () => answerWaitMs(jobQueueRedis()?.budgetMs ?? shared.budgetMs))
}

const services = new WeakMap<AppContext, SearchService>()

/** One search service per app context (its cache and jobs). */
export function searchService(context: AppContext): SearchService {
  let service = services.get(context)
  if (!service) {
    service = new SearchService(context)
    services.set(context, service)
  }
  return service
}
