/**
 * Search as the API offers it: windows checked against the curated materials, answers
 * cached by window and shelf fingerprint, long searches as jobs that report progress and
 * can be cancelled. Jobs live in memory, belong to the user who started them, and are
 * forgotten a while after they finish.
 */
import { randomUUID } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import { parseWindow, windowCacheKey, type ForceWindow, type SearchAnswer, type SearchProgress } from '../../../catalog'
import type { AppContext } from '../../context'
import { HttpError, notFound } from '../../errors'
import { toHttpError } from '../../middleware/error-handler'
import { jobQueueActive, queuedSearchPool } from '../job-queue'
import { sharedSearchPool, type SearchPool } from './pool'
import { loadShelf, type ShelfSnapshot } from './shelf'
import { tradeoffsOf, type Tradeoffs } from './tradeoffs'

/** Answers kept; a window's answer is a few kilobytes. */
export const CACHE_CAPACITY = 200
/** Running searches one user may have at once, over both routes (POST /api/search and jobs). */
export const MAX_RUNNING_PER_USER = 3
/** A finished job is kept this long for a late or repeated events request, ms. */
export const FINISHED_JOB_TTL_MS = 10 * 60_000

/** What the API answers for a search: the catalog's answer and its trade-off points (tradeoffs.ts). */
export type ApiSearchAnswer = SearchAnswer & { tradeoffs: Tradeoffs }

export type JobStatus = 'running' | 'done' | 'failed' | 'cancelled'

export type JobEvent =
  | { event: 'progress'; data: SearchProgress }
  | { event: 'result'; data: ApiSearchAnswer & { cached: boolean } }
  | { event: 'error'; data: { error: { code: string; message: string; details: Record<string, unknown> | null } } }
  | { event: 'cancelled'; data: { id: string } }

export interface SearchJob {
  id: string
  ownerId: number
  status: JobStatus
  cached: boolean
  progress: SearchProgress | null
  final: JobEvent | null
  finishedAt: number | null
  controller: AbortController
  listeners: Set<(event: JobEvent) => void>
}

export interface SearchOutcome {
  answer: ApiSearchAnswer
  cached: boolean
}

export class SearchService {
  private readonly cache = new LRUCache<string, ApiSearchAnswer>({ max: CACHE_CAPACITY })
  private cacheVersion = ''
  private readonly jobs = new Map<string, SearchJob>()
  /** POST /api/search answers being computed, per user (jobs are counted from `jobs`). */
  private readonly answering = new Map<number, number>()
  /** Cache hits and misses since start (tests and the bench read them). */
  readonly stats = { hits: 0, misses: 0 }

  constructor(private readonly context: AppContext, private readonly pool: Pick<SearchPool, 'run'> = jobQueueActive() ? queuedSearchPool : sharedSearchPool()) {}

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

  private async compute(window: ForceWindow, shelf: ShelfSnapshot, key: string, onProgress?: (p: SearchProgress) => void, signal?: AbortSignal): Promise<ApiSearchAnswer> {
    const found = await this.pool.run({ window, shelf: shelf.entries, materials: shelf.materials, shelfVersion: shelf.version }, { onProgress, signal })
    const answer = { ...found, tradeoffs: tradeoffsOf(found) }
    if (this.cacheVersion === shelf.version) this.cache.set(key, answer)
    return answer
  }

  /**
   * Searches of one user being computed now, over both routes. A job the user has cancelled
   * no longer counts, though its thread may take a moment to stop: "cancel one" frees a
   * place at once, as the 429's message promises.
   */
  running(ownerId: number): number {
    let jobs = 0
    for (const j of this.jobs.values()) if (j.ownerId === ownerId && j.status === 'running' && !j.controller.signal.aborted) jobs++
    return jobs + (this.answering.get(ownerId) ?? 0)
  }

  /** 429 when the user already has MAX_RUNNING_PER_USER searches running, whichever route started them. */
  private assertRoom(ownerId: number) {
    const running = this.running(ownerId)
    if (running >= MAX_RUNNING_PER_USER) {
      throw new HttpError(429, 'rate_limited', `you already have ${running} searches running; cancel one or wait for it to finish`, { retryAfterSeconds: 1 })
    }
  }

  /** One search to the end (POST /api/search); `signal` cancels it when the caller leaves. */
  async search(ownerId: number, body: unknown, signal?: AbortSignal): Promise<SearchOutcome> {
    const { window, shelf, key } = await this.prepare(body)
    const hit = this.cache.get(key)
    if (hit) { this.stats.hits++; return { answer: hit, cached: true } }
    this.assertRoom(ownerId)
    this.stats.misses++
    this.answering.set(ownerId, (this.answering.get(ownerId) ?? 0) + 1)
    try {
      return { answer: await this.compute(window, shelf, key, undefined, signal), cached: false }
    } finally {
      const left = (this.answering.get(ownerId) ?? 1) - 1
      if (left > 0) this.answering.set(ownerId, left)
      else this.answering.delete(ownerId)
    }
  }

  /** Starts a search job (POST /api/searches). */
  async start(ownerId: number, body: unknown): Promise<SearchJob> {
    this.sweep()
    const { window, shelf, key } = await this.prepare(body)
    this.assertRoom(ownerId)
    const job: SearchJob = { id: randomUUID(), ownerId, status: 'running', cached: false, progress: null, final: null, finishedAt: null, controller: new AbortController(), listeners: new Set() }
    this.jobs.set(job.id, job)
    const hit = this.cache.get(key)
    if (hit) {
      this.stats.hits++
      job.cached = true
      job.progress = { done: 1, total: 1, considered: hit.considered, phase: 'done' }
      this.finish(job, 'done', { event: 'result', data: { ...hit, cached: true } })
      return job
    }
    this.stats.misses++
    const onProgress = (progress: SearchProgress) => {
      job.progress = progress
      this.emit(job, { event: 'progress', data: progress })
    }
    this.compute(window, shelf, key, onProgress, job.controller.signal).then(
      (answer) => this.finish(job, 'done', { event: 'result', data: { ...answer, cached: false } }),
      (e: Error) => {
        if (e.name === 'AbortError') return this.finish(job, 'cancelled', { event: 'cancelled', data: { id: job.id } })
        const http = toHttpError(e)
        if (http.status >= 500) console.error(e)
        this.finish(job, 'failed', { event: 'error', data: { error: { code: http.code, message: http.message, details: http.details } } })
      },
    )
    return job
  }

  /** The caller's own job; anyone else's is not found (its id says nothing about it). */
  job(ownerId: number, id: string): SearchJob {
    const job = this.jobs.get(id)
    if (!job || job.ownerId !== ownerId) throw notFound('search')
    return job
  }

  /**
   * Follows a job: the latest progress and, once it has ended, its final event are replayed
   * first, so a late listener misses nothing. Returns the unsubscribe function.
   */
  follow(job: SearchJob, listener: (event: JobEvent) => void): () => void {
    if (job.progress) listener({ event: 'progress', data: job.progress })
    if (job.final) { listener(job.final); return () => undefined }
    job.listeners.add(listener)
    return () => job.listeners.delete(listener)
  }

  /** Cancels a running job (it stays, so followers see `cancelled`); forgets an ended one. */
  cancel(job: SearchJob): void {
    if (job.status === 'running') job.controller.abort()
    else this.jobs.delete(job.id)
  }

  private emit(job: SearchJob, event: JobEvent) {
    for (const listener of [...job.listeners]) listener(event)
  }

  private finish(job: SearchJob, status: JobStatus, event: JobEvent) {
    if (job.status !== 'running') return
    job.status = status
    job.final = event
    job.finishedAt = Date.now()
    this.emit(job, event)
    job.listeners.clear()
  }

  private sweep() {
    const cutoff = Date.now() - FINISHED_JOB_TTL_MS
    for (const [id, job] of this.jobs) if (job.finishedAt !== null && job.finishedAt < cutoff) this.jobs.delete(id)
  }
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
