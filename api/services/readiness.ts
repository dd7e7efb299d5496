/**
 * What GET /api/ready checks before a load balancer sends traffic here: a list of named
 * checks, each answering within its own time limit. A new dependency (the job queue, say)
 * adds one entry to readinessChecks.
 */
import type { AppContext } from '../context'
import { jobQueueActive, queueCounts } from './job-queue'

export interface ReadinessCheck {
  name: string
  /** Resolves when the dependency answers; rejects (or times out) when it does not. */
  check: () => Promise<unknown>
}

const CHECK_TIMEOUT_MS = 2000

export function readinessChecks(context: AppContext): ReadinessCheck[] {
  return [
    { name: 'database', check: () => context.db.sequelize.query('SELECT 1') },
    // several instances: the job queue's Redis answers (it counts the waiting and running jobs)
    ...(jobQueueActive() ? [{ name: 'queue', check: () => queueCounts() }] : []),
  ]
}

export interface CheckResult {
  status: 'ok' | 'failed'
  ms: number
  error?: string
}

export async function runReadiness(checks: ReadinessCheck[]): Promise<{ ready: boolean; checks: Record<string, CheckResult> }> {
  const results = await Promise.all(checks.map(async ({ name, check }) => {
    const start = performance.now()
    let timer: NodeJS.Timeout | undefined
    try {
      await Promise.race([check(), new Promise((_, reject) => { timer = setTimeout(() => reject(new Error(`no answer within ${CHECK_TIMEOUT_MS} ms`)), CHECK_TIMEOUT_MS) })])
      return [name, { status: 'ok', ms: Math.round(performance.now() - start) }] as const
    } catch (err) {
      // the kind of failure only: a driver's message may carry a connection string
      return [name, { status: 'failed', ms: Math.round(performance.now() - start), error: (err as Error).name === 'Error' ? (err as Error).message.slice(0, 120) : (err as Error).name }] as const
    } finally {
      clearTimeout(timer)
    }
  }))
  const byName = Object.fromEntries(results) as Record<string, CheckResult>
  return { ready: results.every(([, r]) => r.status === 'ok'), checks: byName }
}
