/**
 * Heavy computations (evaluations, checks, tolerance bands, STL) off the request thread, on a
 * piscina pool of worker threads, so a burst of them never stalls light requests such as the
 * shelf list or /api/health. One pool per process, shared by every app in it.
 *
 * Every compute task runs under the compute budget (compute/budget.ts): a task still running
 * when its budget is spent has its thread stopped (piscina terminates it and starts a fresh
 * one) and the caller gets ComputeBudgetExceededError, a 422 naming what was asked. The queue
 * in front of the threads is bounded; past it a task is refused at once (503 busy).
 *
 * Password hashing has a pool of its own (one small thread, its own bounded queue): a flood of
 * sign-ins waits behind other sign-ins, never in front of an evaluation, and cannot pile up.
 *
 * Threads are opt-in: the server entry calls configureComputePool({ threads }) at start-up
 * (config.computeThreads, FLEXSHELF_COMPUTE_THREADS); anywhere else (tests mounting the app
 * in-process, scripts) tasks run in the calling thread with the same answers and errors, but
 * without a budget (a synchronous task in this thread cannot be stopped).
 */
import { MessageChannel, type MessagePort } from 'node:worker_threads'
import bcrypt from 'bcryptjs'
import { Piscina } from 'piscina'
import type { EvaluateOptions, Evaluation, PartFormat } from '../../catalog'
import type { ToleranceBand } from '../../catalog/tolerance'
import type { PrinterProfile } from '../../catalog/window'
import { ComputeBudgetExceededError, ComputeBusyError, DEFAULT_COMPUTE_BUDGET_MS, type ComputeAsk } from './compute/budget'
import { jobQueueActive, runQueued } from './job-queue'
import { fromFailure, runTask, type CheckComputation, type ComputeOutcome, type ComputeTask, type ReportFit } from './compute/tasks'
import { computeJobDuration, setComputeQueueProbe } from './metrics'

export { ComputeBudgetExceededError, DEFAULT_COMPUTE_BUDGET_MS } from './compute/budget'

const ENTRY = new URL('./compute/worker-entry.mjs', import.meta.url)

/** Tasks waiting per compute thread before new ones are refused (a few seconds of work at most). */
const COMPUTE_QUEUE_PER_THREAD = 16
/** Password hashes waiting before new sign-ins are refused: about 8 s of bcrypt at cost 12 on one thread. */
const PASSWORD_QUEUE = 32

/** Old-generation heap of one compute thread, MB. */
const COMPUTE_THREAD_HEAP_MB = 512

type Pool = Piscina<ComputeTask & { started?: MessagePort }, ComputeOutcome>

let pool: Pool | null = null
let passwordPool: Pool | null = null
let budgetMs = DEFAULT_COMPUTE_BUDGET_MS

function makePool(threads: number, maxQueue: number): Pool {
  return new Piscina({
    filename: ENTRY.href,
    minThreads: threads,
    maxThreads: threads,
    maxQueue,
    // a runaway task ends its own thread (ERR_WORKER_OUT_OF_MEMORY), never the server
    resourceLimits: { maxOldGenerationSizeMb: COMPUTE_THREAD_HEAP_MB },
    // threads stay warm: starting one (tsx plus the catalog) takes about a second
    idleTimeout: Number.POSITIVE_INFINITY,
  })
}

export interface ComputePoolOptions {
  /** Compute threads; 0 runs every task in the calling thread (no budget). */
  threads: number
  /** Per-task budget, ms (config.computeBudgetMs); unchanged when left out. */
  budgetMs?: number
  /** Password-hashing threads; 1 when compute threads are on, 0 otherwise. */
  passwordThreads?: number
}

/** Starts (threads ≥ 1) or stops (0) the pools; tasks already running finish. */
export async function configureComputePool(options: ComputePoolOptions): Promise<void> {
  const old = [pool, passwordPool]
  if (options.budgetMs !== undefined) budgetMs = options.budgetMs
  pool = options.threads > 0 ? makePool(options.threads, options.threads * COMPUTE_QUEUE_PER_THREAD) : null
  const passwordThreads = options.passwordThreads ?? (options.threads > 0 ? 1 : 0)
  passwordPool = passwordThreads > 0 ? makePool(passwordThreads, PASSWORD_QUEUE) : null
  await Promise.all(old.map((p) => p?.close()))
}

export const computeThreads = () => (pool ? pool.maxThreads : 0)
export const computeBudgetMs = () => budgetMs

// for /metrics: tasks submitted and not yet answered; those not waiting in a piscina queue are running
let inFlight = 0
const queued = () => Math.min(inFlight, (pool?.queueSize ?? 0) + (passwordPool?.queueSize ?? 0))
setComputeQueueProbe({ queued, running: () => inFlight - queued() })

async function timed<T>(kind: ComputeTask['kind'], work: () => Promise<T>): Promise<T> {
  const stop = computeJobDuration.startTimer({ kind })
  inFlight++
  try {
    const value = await work()
    stop({ outcome: 'ok' })
    return value
  } catch (err) {
    stop({ outcome: 'failed' })
    throw err
  } finally {
    inFlight--
  }
}

const runBudgeted = (task: ComputeTask, ask: ComputeAsk) => timed(task.kind, () => runBudgetedUntimed(task, ask))
const runPassword = (task: Extract<ComputeTask, { kind: 'hashPassword' | 'comparePassword' }>) => timed(task.kind, () => runPasswordUntimed(task))

function isQueueFull(err: unknown): boolean {
  return err instanceof Error && /queue is at limit|No task queue available/i.test(err.message)
}

/**
 * Runs a task on the compute pool under the budget. The worker posts on `started` as soon as
 * it picks the task up; only then does the budget's clock start.
 */
async function runBudgetedUntimed(task: ComputeTask, ask: ComputeAsk): Promise<unknown> {
  // several instances: the job queue's workers run it (api/services/job-queue.ts), never this process
  if (jobQueueActive()) return runQueued(task, ask, budgetMs)
  return runHere(task, ask)
}

/** Runs a task on this process's pool under the budget (what a queue worker does with a job). */
export async function runHere(task: ComputeTask, ask: ComputeAsk): Promise<unknown> {
  if (!pool) return runTask(task)
  const current = pool
  const limit = budgetMs
  const controller = new AbortController()
  const { port1, port2 } = new MessageChannel()
  let timer: NodeJS.Timeout | undefined
  let exceeded = false
  port1.once('message', () => {
    timer = setTimeout(() => {
      exceeded = true
      controller.abort()
    }, limit)
  })
  try {
    const outcome = await current.run({ ...task, started: port2 }, { signal: controller.signal, transferList: [port2] })
    if (!outcome.ok) throw fromFailure(outcome.error)
    return outcome.value
  } catch (err) {
    if (exceeded) throw new ComputeBudgetExceededError(ask, limit)
    if (isQueueFull(err)) throw new ComputeBusyError(ask.what)
    throw err
  } finally {
    clearTimeout(timer)
    port1.close()
  }
}

async function runPasswordUntimed(task: Extract<ComputeTask, { kind: 'hashPassword' | 'comparePassword' }>): Promise<unknown> {
  if (!passwordPool) {
    // without threads bcrypt runs in its asynchronous form, which yields between rounds
    return task.kind === 'hashPassword' ? bcrypt.hash(task.password, task.cost) : bcrypt.compare(task.password, task.hash)
  }
  try {
    const outcome = await passwordPool.run(task)
    if (!outcome.ok) throw fromFailure(outcome.error)
    return outcome.value
  } catch (err) {
    if (isQueueFull(err)) throw new ComputeBusyError('the password check')
    throw err
  }
}

type BandOptions = Extract<ComputeTask, { kind: 'band' }>['options']
type EvaluateTaskOptions = { method?: string; ranges?: EvaluateOptions['ranges']; materials?: EvaluateOptions['materials'] }

const methodWords = (method?: string) => (method ? ` (method ${method})` : '')

export const compute = {
  evaluate: (familyId: string, params: unknown, options: EvaluateTaskOptions = {}, what = `the evaluation of ${familyId}${methodWords(options.method)}`) =>
    runBudgeted({ kind: 'evaluate', familyId, params, options }, { task: 'evaluate', what, familyId }) as Promise<Evaluation>,
  toleranceBand: (familyId: string, params: unknown, options: BandOptions = {}, what = `the tolerance band of ${familyId}${methodWords(options?.method)}`) =>
    runBudgeted({ kind: 'band', familyId, params, options }, { task: 'band', what, familyId }) as Promise<ToleranceBand>,
  /** The band and the printability of a check (or a data sheet, `task` says which). */
  check: (familyId: string, params: unknown, options: BandOptions, printer: Partial<PrinterProfile>, ask: Partial<ComputeAsk> = {}) =>
    runBudgeted({ kind: 'check', familyId, params, options, printer }, {
      task: ask.task ?? 'check', what: ask.what ?? `the check of ${familyId}${methodWords(options?.method)}`, familyId,
    }) as Promise<CheckComputation>,
  stl: (familyId: string, params: unknown, what = `the STL of ${familyId}`) =>
    runBudgeted({ kind: 'stl', familyId, params }, { task: 'stl', what, familyId }) as Promise<Uint8Array>,
  /** 3MF (bytes), DXF or SVG (text) of the solid buildGeometry makes. */
  partFile: (format: PartFormat, familyId: string, params: unknown, meta: Extract<ComputeTask, { kind: 'partFile' }>['meta'], what = `the ${format.toUpperCase()} of ${familyId}`) =>
    runBudgeted({ kind: 'partFile', format, familyId, params, meta }, { task: 'stl', what, familyId }) as Promise<Uint8Array | string>,
  /**
   * A test report's comparison and modulus fit. With several instances it goes to the queue's
   * workers like the rest (budget, pick-up deadline, re-run after a worker dies); on one
   * machine it stays in the calling thread as before (a fit takes milliseconds, a thread hop more).
   */
  reportFit: async (task: Omit<Extract<ComputeTask, { kind: 'reportFit' }>, 'kind'>, what = `the fit of a test report to ${task.familyId}`) => {
    const full = { kind: 'reportFit' as const, ...task }
    if (jobQueueActive()) return runBudgeted(full, { task: 'reportFit', what, familyId: task.familyId }) as Promise<ReportFit>
    return runTask(full) as ReportFit
  },
  hashPassword: (password: string, cost: number) => runPassword({ kind: 'hashPassword', password, cost }) as Promise<string>,
  comparePassword: (password: string, hash: string) => runPassword({ kind: 'comparePassword', password, hash }) as Promise<boolean>,
}
