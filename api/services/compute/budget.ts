/**
 * The compute budget: how long one heavy task (evaluation, check, band, STL, data sheet,
 * search) may run on its worker thread before the thread is stopped. The clock starts when
 * the task starts running, not while it waits in the queue, so a busy pool does not eat a
 * request's budget; the queue itself is bounded (ComputeBusyError).
 */
import { HttpError } from '../../errors'

/** Ten seconds: far above any accepted configuration here (common practice for interactive work: answer or give up). */
export const DEFAULT_COMPUTE_BUDGET_MS = 10_000

/** What a task was, in words for the 422 message ("the tolerance band of leaf-hinge"). */
export interface ComputeAsk {
  /** Task kind as named in the answer's details: evaluate, check, band, stl, datasheet, search. */
  task: string
  /** Plain words: "the check of leaf-hinge (method nonlinear-fe)". */
  what: string
  familyId?: string
}

export class ComputeBudgetExceededError extends HttpError {
  constructor(readonly ask: ComputeAsk, readonly budgetMs: number) {
    super(
      422,
      'compute_budget_exceeded',
      `${ask.what} took longer than the compute budget of ${formatMs(budgetMs)} and was stopped; try coarser or smaller values`,
      { task: ask.task, familyId: ask.familyId ?? null, budgetMs },
    )
    this.name = 'ComputeBudgetExceededError'
  }
}

/** The compute queue is full: answer at once rather than pile work up behind it. */
export class ComputeBusyError extends HttpError {
  constructor(what: string, retryAfterSeconds = 2) {
    super(503, 'busy', `the server is busy with other computations; ${what} was not started, try again in a moment`, { retryAfterSeconds })
    this.name = 'ComputeBusyError'
  }
}

function formatMs(ms: number): string {
  return ms >= 1000 ? `${Number((ms / 1000).toFixed(1))} s` : `${ms} ms`
}
