/**
 * The pool of search threads shared by every app in the process, on piscina: searches run off
 * the request thread, so sign-ins and page loads are not stalled by a long one. Threads start
 * on first use, stay warm (starting one, tsx plus the catalog, takes about a second), and a
 * thread that dies is replaced by piscina.
 *
 * A search is time-sliced in its thread, so one thread interleaves several. Each task carries
 * a MessagePort: progress comes back on it, and a cancel goes out on it, read between slices.
 * The compute budget works as before: past it the search is first asked to stop; a thread
 * still busy BUDGET_GRACE_MS after is terminated (piscina replaces it), and
 * the other searches it was running are refused as busy (503), not failed. Past
 * SEARCHES_PER_THREAD running per thread, searches wait in piscina's queue; a full queue
 * refuses a new one at once (503 busy). The per-user limit is the search service's.
 */
import { availableParallelism } from 'node:os'
import { MessageChannel } from 'node:worker_threads'
import { Piscina } from 'piscina'
import type { SearchAnswer, SearchProgress } from '../../../catalog'
import { SearchCancelledError, ValidationError } from '../../../catalog'
import { ComputeBudgetExceededError, ComputeBusyError, type ComputeAsk } from '../compute/budget'
import { computeBudgetMs } from '../compute-pool'
import type { PortMessage, SearchTask, ThreadOutcome, ThreadTask } from './protocol'

export interface RunOptions {
  onProgress?: (progress: SearchProgress) => void
  signal?: AbortSignal
  /** The compute budget, ms; the process's (FLEXSHELF_COMPUTE_BUDGET_MS) when left out. */
  budgetMs?: number
  /** What the 422 names when the budget runs out. */
  ask?: ComputeAsk
}

/**
 * A search past its budget is first asked to stop (the search is time-sliced and reads the
 * cancel between slices); a thread still busy this long after is terminated and replaced.
 */
const BUDGET_GRACE_MS = 250
/** Old-generation heap of one search thread, MB: a runaway search ends its thread, not the server. */
const SEARCH_THREAD_HEAP_MB = 512
/** Searches one thread interleaves before further ones wait in the queue. */
const SEARCHES_PER_THREAD = 8
/** Searches waiting per thread before a new one is refused as busy. */
const SEARCH_QUEUE_PER_THREAD = 16

/** Longest wait, once a search has ended, for its last progress message, ms. */
const PORT_DRAIN_MS = 200

const ENTRY = new URL('./worker-entry.mjs', import.meta.url)

/** One thread per core beyond the one serving requests, at least one and at most two. */
const DEFAULT_POOL_SIZE = Math.max(1, Math.min(2, availableParallelism() - 1))

/** A failure the thread reported itself (passed on as it is). */
class OutcomeError extends Error {}

function isQueueFull(err: unknown): boolean {
  return err instanceof Error && /queue is at limit|No task queue available/i.test(err.message)
}

export class SearchPool {
  private pool: Piscina<ThreadTask, ThreadOutcome> | null = null
  private spawned = 0

  constructor(readonly size = DEFAULT_POOL_SIZE) {}

  private threads(): Piscina<ThreadTask, ThreadOutcome> {
    if (!this.pool) {
      const pool = new Piscina<ThreadTask, ThreadOutcome>({
        filename: ENTRY.href,
        minThreads: 0,
        maxThreads: this.size,
        concurrentTasksPerWorker: SEARCHES_PER_THREAD,
        maxQueue: this.size * SEARCH_QUEUE_PER_THREAD,
        resourceLimits: { maxOldGenerationSizeMb: SEARCH_THREAD_HEAP_MB },
        idleTimeout: Number.POSITIVE_INFINITY,
        // a thread interleaves time-sliced searches on its event loop: never block it waiting for tasks
        atomics: 'disabled',
      })
      pool.on('workerCreate', () => { this.spawned++ })
      // a thread that dies with no search on it is replaced; nothing to report to a caller
      pool.on('error', () => undefined)
      this.pool = pool
    }
    return this.pool
  }

  /** Runs one search in a search thread; rejects with an AbortError when cancelled. */
  async run(task: SearchTask, options: RunOptions = {}): Promise<SearchAnswer> {
    if (options.signal?.aborted) throw new SearchCancelledError()
    const pool = this.threads()
    const budgetMs = options.budgetMs ?? computeBudgetMs()
    const ask = options.ask ?? { task: 'search', what: `the search for a ${task.window.kind} window` }
    const { port1, port2 } = new MessageChannel()
    let exceeded = false
    let grace: NodeJS.Timeout | undefined
    /** The thread running this search, once it has picked it up. */
    let threadId: number | null = null
    const cancel = () => port1.postMessage({ type: 'cancel' } satisfies PortMessage)
    options.signal?.addEventListener('abort', cancel, { once: true })
    const budget = setTimeout(() => {
      exceeded = true
      cancel()
      grace = setTimeout(() => this.stopThread(threadId), BUDGET_GRACE_MS)
    }, budgetMs)
    port1.on('message', (m: PortMessage) => {
      if (m.type === 'started') threadId = m.threadId
      else if (m.type === 'progress') options.onProgress?.(m.progress)
    })
    // the thread closes its end when the task ends, after its last progress message
    const drained = new Promise<void>((resolve) => port1.once('close', resolve))
    try {
      // no abort signal is handed to piscina: it would run one search per thread instead of interleaving them
      const outcome = await pool.run({ task, port: port2 }, { transferList: [port2] })
      // the outcome and the progress travel on different channels: let the last progress arrive first
      await Promise.race([drained, new Promise<void>((resolve) => setTimeout(resolve, PORT_DRAIN_MS))])
      if (outcome.type === 'result') return outcome.answer
      if (exceeded) throw new ComputeBudgetExceededError(ask, budgetMs)
      if (outcome.type === 'cancelled') throw new SearchCancelledError()
      if (outcome.issues) throw new ValidationError(outcome.issues)
      throw new OutcomeError(`search failed in its thread: ${outcome.name}: ${outcome.message}`)
    } catch (err) {
      if (err instanceof ComputeBudgetExceededError || err instanceof SearchCancelledError || err instanceof ValidationError || err instanceof OutcomeError) throw err
      if (exceeded) throw new ComputeBudgetExceededError(ask, budgetMs)
      if (isQueueFull(err)) throw new ComputeBusyError('the search')
      // another search past its budget had this thread stopped: this one is refused as busy, not failed
      if (threadId !== null && this.stopped.has(threadId)) throw new ComputeBusyError('the search')
      throw new Error(`the search thread failed: ${(err as Error).message}`)
    } finally {
      clearTimeout(budget)
      clearTimeout(grace)
      options.signal?.removeEventListener('abort', cancel)
      port1.close()
    }
  }

  /** Threads this pool stopped (a search past its budget that did not stop when asked). */
  private readonly stopped = new Set<number>()

  /** Ends a thread that did not stop when asked; piscina replaces it and fails its other searches, which run() refuses as busy. */
  private stopThread(threadId: number | null): void {
    if (threadId === null || !this.pool) return
    const worker = this.pool.threads.find((w) => w.threadId === threadId)
    if (!worker) return
    this.stopped.add(threadId)
    void worker.terminate()
  }

  /** Threads started so far (tests and the bench read it). */
  get started(): number {
    return this.spawned
  }

  async close(): Promise<void> {
    const pool = this.pool
    this.pool = null
    this.spawned = 0
    await pool?.destroy()
  }
}

let shared: SearchPool | null = null

/** The process's one pool. */
export function sharedSearchPool(): SearchPool {
  shared ??= new SearchPool()
  return shared
}
