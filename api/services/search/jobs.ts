/**
 * Where search jobs and the per-user running places live. One process keeps them in memory;
 * with the job queue on Redis (several API instances) they live in Redis, so a job started on
 * one instance is read, followed (its events reach every instance by pub/sub) and cancelled on
 * any other, and the per-user limit counts the user's searches on every instance.
 *
 * A running place is taken atomically before a search starts and given back when it ends or
 * is cancelled. In Redis a place carries an expiry (the longest a queued answer is waited
 * for), so the places of an instance that died free themselves.
 */
import type { Redis } from 'ioredis'
import type { SearchAnswer, SearchProgress } from '../../../catalog'
import { connectRedis } from '../redis'
import type { Tradeoffs } from './tradeoffs'

/** What the API answers for a search: the catalog's answer and its trade-off points (tradeoffs.ts). */
export type ApiSearchAnswer = SearchAnswer & { tradeoffs: Tradeoffs }

export type JobStatus = 'running' | 'done' | 'failed' | 'cancelled'

export type JobEvent =
  | { event: 'progress'; data: SearchProgress }
  | { event: 'result'; data: ApiSearchAnswer & { cached: boolean } }
  | { event: 'error'; data: { error: { code: string; message: string; details: Record<string, unknown> | null } } }
  | { event: 'cancelled'; data: { id: string } }

/** A search job as plain data (the same on every instance). */
export interface SearchJobRecord {
  id: string
  ownerId: number
  status: JobStatus
  cached: boolean
  progress: SearchProgress | null
  /** The result, error or cancelled event once the job has ended. */
  final: JobEvent | null
  finishedAt: number | null
}

export interface SearchJobRegistry {
  /** Takes one of the owner's running places for `member` unless `limit` are taken; answers whether it did and how many run. */
  reserve(ownerId: number, member: string, limit: number): Promise<{ taken: boolean; running: number }>
  release(ownerId: number, member: string): Promise<void>
  running(ownerId: number): Promise<number>
  create(record: SearchJobRecord): Promise<void>
  get(id: string): Promise<SearchJobRecord | null>
  /** Records and announces progress of a running job. */
  progress(id: string, progress: SearchProgress): Promise<void>
  /** Ends a running job with its final event (announced to every follower); false when it had already ended. */
  finish(id: string, status: Exclude<JobStatus, 'running'>, event: JobEvent): Promise<boolean>
  forget(id: string): Promise<void>
  /**
   * Follows a job: its latest progress and, once it has ended, its final event are replayed
   * first, so a late follower misses nothing; nothing reaches the listener after the final
   * event. Answers the unsubscribe function.
   */
  follow(id: string, listener: (event: JobEvent) => void): Promise<() => void>
  close(): Promise<void>
}

/** Delivers at most one final event and nothing after it. */
function untilFinal(listener: (event: JobEvent) => void, ended: () => void): (event: JobEvent) => void {
  let done = false
  return (event) => {
    if (done) return
    if (event.event !== 'progress') { done = true; ended() }
    listener(event)
  }
}

/** One process: jobs in a map, forgotten a while after they end (`ttlMs`). */
export class MemorySearchJobs implements SearchJobRegistry {
  private readonly jobs = new Map<string, SearchJobRecord>()
  private readonly listeners = new Map<string, Set<(event: JobEvent) => void>>()
  private readonly places = new Map<number, Set<string>>()

  constructor(private readonly ttlMs: number) {}

  async reserve(ownerId: number, member: string, limit: number) {
    const mine = this.places.get(ownerId) ?? new Set<string>()
    if (mine.size >= limit) return { taken: false, running: mine.size }
    mine.add(member)
    this.places.set(ownerId, mine)
    return { taken: true, running: mine.size }
  }

  async release(ownerId: number, member: string) {
    const mine = this.places.get(ownerId)
    mine?.delete(member)
    if (mine && !mine.size) this.places.delete(ownerId)
  }

  async running(ownerId: number) {
    return this.places.get(ownerId)?.size ?? 0
  }

  async create(record: SearchJobRecord) {
    this.sweep()
    this.jobs.set(record.id, { ...record })
  }

  async get(id: string) {
    const job = this.jobs.get(id)
    return job ? { ...job } : null
  }

  async progress(id: string, progress: SearchProgress) {
    const job = this.jobs.get(id)
    if (!job || job.status !== 'running') return
    job.progress = progress
    this.emit(id, { event: 'progress', data: progress })
  }

  async finish(id: string, status: Exclude<JobStatus, 'running'>, event: JobEvent) {
    const job = this.jobs.get(id)
    if (!job || job.status !== 'running') return false
    Object.assign(job, { status, final: event, finishedAt: Date.now() })
    this.emit(id, event)
    this.listeners.delete(id)
    return true
  }

  async forget(id: string) {
    this.jobs.delete(id)
  }

  async follow(id: string, listener: (event: JobEvent) => void) {
    const job = this.jobs.get(id)
    if (!job) return () => undefined
    if (job.progress) listener({ event: 'progress', data: job.progress })
    if (job.final) { listener(job.final); return () => undefined }
    const set = this.listeners.get(id) ?? new Set()
    this.listeners.set(id, set)
    const once = untilFinal(listener, () => set.delete(once))
    set.add(once)
    return () => { set.delete(once) }
  }

  async close() {
    this.listeners.clear()
  }

  private emit(id: string, event: JobEvent) {
    for (const listener of [...(this.listeners.get(id) ?? [])]) listener(event)
  }

  private sweep() {
    const cutoff = Date.now() - this.ttlMs
    for (const [id, job] of this.jobs) if (job.finishedAt !== null && job.finishedAt < cutoff) this.jobs.delete(id)
  }
}

const PREFIX = 'flexshelf:'
const jobKey = (id: string) => `${PREFIX}search-job:${id}`
const placesKey = (ownerId: number) => `${PREFIX}search-running:${ownerId}`
const SEARCH_JOB_EVENTS_CHANNEL = `${PREFIX}search-job-events`

// each script reads and writes in one step, so two instances acting on one job or one user's
// places at the same moment cannot both win; a job's event is published in the same step as
// the state it announces, so a follower reading the job and then hearing events misses none
const RESERVE = `
redis.call('ZREMRANGEBYSCORE', KEYS[1], '-inf', ARGV[1])
local n = redis.call('ZCARD', KEYS[1])
if n >= tonumber(ARGV[3]) then return {0, n} end
redis.call('ZADD', KEYS[1], ARGV[2], ARGV[4])
redis.call('PEXPIRE', KEYS[1], ARGV[5])
return {1, n + 1}`
const PROGRESS = `
if redis.call('HGET', KEYS[1], 'status') ~= 'running' then return 0 end
redis.call('HSET', KEYS[1], 'progress', ARGV[1])
redis.call('PUBLISH', ARGV[2], ARGV[3])
return 1`
const FINISH = `
if redis.call('HGET', KEYS[1], 'status') ~= 'running' then return 0 end
redis.call('HSET', KEYS[1], 'status', ARGV[1], 'final', ARGV[2], 'finishedAt', ARGV[3])
redis.call('PEXPIRE', KEYS[1], ARGV[4])
redis.call('PUBLISH', ARGV[5], ARGV[6])
return 1`

/**
 * Several instances: each job is a hash in Redis (expiring `ttlMs` after it ends, or after
 * `runningTtlMs() + ttlMs` if no instance ever ends it); events go out on one channel that
 * every instance hears on a subscriber connection of its own and hands to its followers.
 */
export class RedisSearchJobs implements SearchJobRegistry {
  private readonly subscriber: Redis
  private readonly subscribed: Promise<unknown>
  private readonly listeners = new Map<string, Set<(event: JobEvent) => void>>()

  constructor(private readonly redis: Redis, url: string, private readonly ttlMs: number, private readonly runningTtlMs: () => number) {
    this.subscriber = connectRedis(url, 'search-jobs')
    this.subscribed = this.subscriber.subscribe(SEARCH_JOB_EVENTS_CHANNEL)
    this.subscriber.on('message', (_channel: string, message: string) => {
      const { id, event } = JSON.parse(message) as { id: string; event: JobEvent }
      for (const listener of [...(this.listeners.get(id) ?? [])]) listener(event)
    })
  }

  async reserve(ownerId: number, member: string, limit: number) {
    const now = Date.now()
    const ttl = this.runningTtlMs()
    const [taken, running] = await this.redis.eval(RESERVE, 1, placesKey(ownerId), String(now), String(now + ttl), String(limit), member, String(ttl)) as [number, number]
    return { taken: taken === 1, running }
  }

  async release(ownerId: number, member: string) {
    await this.redis.zrem(placesKey(ownerId), member)
  }

  async running(ownerId: number) {
    return this.redis.zcount(placesKey(ownerId), Date.now(), '+inf')
  }

  async create(record: SearchJobRecord) {
    const key = jobKey(record.id)
    await this.redis.multi()
      .hset(key, {
        ownerId: String(record.ownerId), status: record.status, cached: record.cached ? '1' : '0',
        progress: JSON.stringify(record.progress), final: JSON.stringify(record.final), finishedAt: String(record.finishedAt ?? ''),
      })
      .pexpire(key, record.finishedAt === null ? this.runningTtlMs() + this.ttlMs : this.ttlMs)
      .exec()
  }

  async get(id: string): Promise<SearchJobRecord | null> {
    const h = await this.redis.hgetall(jobKey(id))
    if (!h.status) return null
    return {
      id, ownerId: Number(h.ownerId), status: h.status as JobStatus, cached: h.cached === '1',
      progress: JSON.parse(h.progress ?? 'null'), final: JSON.parse(h.final ?? 'null'), finishedAt: h.finishedAt ? Number(h.finishedAt) : null,
    }
  }

  async progress(id: string, progress: SearchProgress) {
    const event: JobEvent = { event: 'progress', data: progress }
    await this.redis.eval(PROGRESS, 1, jobKey(id), JSON.stringify(progress), SEARCH_JOB_EVENTS_CHANNEL, JSON.stringify({ id, event }))
  }

  async finish(id: string, status: Exclude<JobStatus, 'running'>, event: JobEvent) {
    const ended = await this.redis.eval(FINISH, 1, jobKey(id), status, JSON.stringify(event), String(Date.now()), String(this.ttlMs), SEARCH_JOB_EVENTS_CHANNEL, JSON.stringify({ id, event }))
    return ended === 1
  }

  async forget(id: string) {
    await this.redis.del(jobKey(id))
  }

  async follow(id: string, listener: (event: JobEvent) => void) {
    // listen first, then read: an event published in between is heard (progress maybe twice, the final event once)
    await this.subscribed
    const set = this.listeners.get(id) ?? new Set()
    this.listeners.set(id, set)
    const stop = () => {
      set.delete(once)
      if (!set.size) this.listeners.delete(id)
    }
    const once = untilFinal(listener, stop)
    set.add(once)
    const job = await this.get(id).catch((err: unknown) => { stop(); throw err })
    if (job?.progress) once({ event: 'progress', data: job.progress })
    if (job?.final) once(job.final)
    return stop
  }

  async close() {
    this.listeners.clear()
    await this.subscriber.quit().catch(() => undefined)
  }
}
