/**
 * Heavy computations (evaluations, tolerance bands, STL, bcrypt) off the request thread, on a
 * piscina pool of worker threads, so a burst of them never stalls light requests such as the
 * shelf list or a sign-in. One pool per process, shared by every app in it.
 *
 * Threads are opt-in: the server entry calls configureComputePool({ threads }) at start-up
 * (config.computeThreads, FLEXSHELF_COMPUTE_THREADS);
 * anywhere else (tests mounting the app in-process, scripts) tasks run in the calling thread,
 * with the same answers and errors.
 */
import bcrypt from 'bcryptjs'
import { Piscina } from 'piscina'
import type { EvaluateOptions, Evaluation } from '../../catalog'
import type { ToleranceBand } from '../../catalog/tolerance'
import { fromFailure, runTask, type ComputeOutcome, type ComputeTask } from './compute/tasks'

const ENTRY = new URL('./compute/worker-entry.mjs', import.meta.url)

let pool: Piscina<ComputeTask, ComputeOutcome> | null = null

/** Starts (threads ≥ 1) or stops (0) the pool; tasks already running finish. */
export async function configureComputePool(options: { threads: number }): Promise<void> {
  const old = pool
  pool = options.threads > 0
    ? new Piscina<ComputeTask, ComputeOutcome>({
      filename: ENTRY.href,
      minThreads: options.threads,
      maxThreads: options.threads,
      // threads stay warm: starting one (tsx plus the catalog) takes about a second
      idleTimeout: Number.POSITIVE_INFINITY,
    })
    : null
  if (old) await old.close()
}

export const computeThreads = () => (pool ? pool.maxThreads : 0)

async function run(task: ComputeTask): Promise<unknown> {
  if (!pool) {
    // without threads bcrypt runs in its asynchronous form, which yields between rounds
    if (task.kind === 'hashPassword') return bcrypt.hash(task.password, task.cost)
    if (task.kind === 'comparePassword') return bcrypt.compare(task.password, task.hash)
    return runTask(task)
  }
  const outcome = await pool.run(task)
  if (!outcome.ok) throw fromFailure(outcome.error)
  return outcome.value
}

export const compute = {
  evaluate: (familyId: string, params: unknown, options: { method?: string; ranges?: EvaluateOptions['ranges']; materials?: EvaluateOptions['materials'] } = {}) =>
    run({ kind: 'evaluate', familyId, params, options }) as Promise<Evaluation>,
  toleranceBand: (familyId: string, params: unknown, options: Extract<ComputeTask, { kind: 'band' }>['options'] = {}) =>
    run({ kind: 'band', familyId, params, options }) as Promise<ToleranceBand>,
  stl: (familyId: string, params: unknown) => run({ kind: 'stl', familyId, params }) as Promise<Uint8Array>,
  hashPassword: (password: string, cost: number) => run({ kind: 'hashPassword', password, cost }) as Promise<string>,
  comparePassword: (password: string, hash: string) => run({ kind: 'comparePassword', password, hash }) as Promise<boolean>,
}
