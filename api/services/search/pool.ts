/**
 * A small pool of search threads shared by every app in the process: searches run off the
 * request thread, so sign-ins and page loads are not stalled by a long one. Threads start
 * on first use, are unref'd (they never hold the process open) and are replaced if one dies.
 */
import { availableParallelism } from 'node:os'
import { Worker } from 'node:worker_threads'
import type { SearchAnswer, SearchProgress } from '../../../catalog'
import { SearchCancelledError, ValidationError } from '../../../catalog'
import { ComputeBudgetExceededError, ComputeBusyError, type ComputeAsk } from '../compute/budget'
import { computeBudgetMs } from '../compute-pool'
import type { FromWorker, SearchTask } from './protocol'

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
export const BUDGET_GRACE_MS = 250
/** Old-generation heap of one search thread, MB: a runaway search ends its thread, not the server. */
export const SEARCH_THREAD_HEAP_MB = 512

interface Pending {
  resolve: (answer: SearchAnswer) => void
  reject: (error: Error) => void
  onProgress?: (progress: SearchProgress) => void
}

interface Thread {
  worker: Worker
  pending: Map<number, Pending>
}

const ENTRY = new URL('./worker-entry.mjs', import.meta.url)

/** One thread per core beyond the one serving requests, at least one and at most two. */
export const DEFAULT_POOL_SIZE = Math.max(1, Math.min(2, availableParallelism() - 1))

export class SearchPool {
  private threads: Thread[] = []
  private nextId = 1

  constructor(readonly size = DEFAULT_POOL_SIZE) {}

  /** Runs one search on the least busy thread; rejects with an AbortError when cancelled. */
  run(task: SearchTask, options: RunOptions = {}): Promise<SearchAnswer> {
    if (options.signal?.aborted) return Promise.reject(new SearchCancelledError())
    const thread = this.pick()
    const id = this.nextId++
    const budgetMs = options.budgetMs ?? computeBudgetMs()
    const ask = options.ask ?? { task: 'search', what: `the search for a ${task.window.kind} window` }
    return new Promise<SearchAnswer>((resolve, reject) => {
      let exceeded = false
      let grace: NodeJS.Timeout | undefined
      const abort = () => thread.worker.postMessage({ type: 'cancel', id })
      options.signal?.addEventListener('abort', abort, { once: true })
      const budget = setTimeout(() => {
        exceeded = true
        abort()
        grace = setTimeout(() => this.stop(thread), BUDGET_GRACE_MS)
      }, budgetMs)
      const settle = () => {
        clearTimeout(budget)
        clearTimeout(grace)
        options.signal?.removeEventListener('abort', abort)
      }
      thread.pending.set(id, {
        resolve: (a) => { settle(); resolve(a) },
        reject: (e) => { settle(); reject(exceeded ? new ComputeBudgetExceededError(ask, budgetMs) : e) },
        onProgress: options.onProgress,
      })
      thread.worker.postMessage({ type: 'run', id, task })
    })
  }

  /** Ends a thread that did not stop when asked; its other searches are refused as busy (503), not failed. */
  private stop(thread: Thread) {
    if (!this.threads.includes(thread)) return
    this.threads = this.threads.filter((t) => t !== thread)
    for (const p of thread.pending.values()) p.reject(new ComputeBusyError('the search'))
    thread.pending.clear()
    void thread.worker.terminate()
  }

  /** Threads started so far (tests and the bench read it). */
  get started(): number {
    return this.threads.length
  }

  async close(): Promise<void> {
    const threads = this.threads
    this.threads = []
    await Promise.all(threads.map((t) => t.worker.terminate()))
  }

  private pick(): Thread {
    if (this.threads.length < this.size) {
      const idle = this.threads.find((t) => t.pending.size === 0)
      if (idle) return idle
      return this.spawn()
    }
    return this.threads.reduce((a, b) => (b.pending.size < a.pending.size ? b : a))
  }

  private spawn(): Thread {
    const worker = new Worker(ENTRY, { resourceLimits: { maxOldGenerationSizeMb: SEARCH_THREAD_HEAP_MB } })
    worker.unref()
    const thread: Thread = { worker, pending: new Map() }
    worker.on('message', (m: FromWorker) => this.receive(thread, m))
    const fail = (error: Error) => {
      this.threads = this.threads.filter((t) => t !== thread)
      for (const p of thread.pending.values()) p.reject(error)
      thread.pending.clear()
    }
    worker.on('error', (e) => fail(new Error(`the search thread failed: ${e.message}`)))
    worker.on('exit', (code) => fail(new Error(`the search thread stopped (exit code ${code})`)))
    this.threads.push(thread)
    return thread
  }

  private receive(thread: Thread, m: FromWorker) {
    if (m.type === 'ready') return
    const p = thread.pending.get(m.id)
    if (!p) return
    if (m.type === 'progress') { p.onProgress?.(m.progress); return }
    thread.pending.delete(m.id)
    if (m.type === 'result') p.resolve(m.answer)
    else if (m.type === 'cancelled') p.reject(new SearchCancelledError())
    else if (m.issues) p.reject(new ValidationError(m.issues))
    else p.reject(new Error(`search failed in its thread: ${m.name}: ${m.message}`))
  }
}

let shared: SearchPool | null = null

/** The process's one pool. */
export function sharedSearchPool(): SearchPool {
  shared ??= new SearchPool()
  return shared
}
