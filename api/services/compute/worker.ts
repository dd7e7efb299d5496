/** A compute pool thread: piscina calls the default export once per task. */
import { runTaskSafely, type ComputeOutcome, type ComputeTask } from './tasks'

export default function compute(task: ComputeTask): ComputeOutcome {
  return runTaskSafely(task)
}
