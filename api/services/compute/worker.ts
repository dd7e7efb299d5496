/** A compute pool thread: piscina calls the default export once per task. */
import type { MessagePort } from 'node:worker_threads'
import { runTaskSafely, type ComputeOutcome, type ComputeTask } from './tasks'

export default function compute(task: ComputeTask & { started?: MessagePort }): ComputeOutcome {
  const { started, ...rest } = task
  // the budget's clock starts now (compute-pool.ts), not while the task waited in the queue
  // (the main thread closes the channel when the task settles)
  started?.postMessage(0)
  return runTaskSafely(rest as ComputeTask)
}
