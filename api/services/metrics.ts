/**
 * The one Prometheus registry (prom-client) behind /metrics. Every metric of the server is
 * defined here, so an exporter added later (the job queue's depth, say) joins the same list;
 * modules that feed a metric import it from here and nothing else (no import cycles).
 * Route labels are Express route patterns (`/api/entries/:id`), never raw paths, so the
 * number of series stays bounded and no token in a path reaches the metrics.
 */
import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client'

export const metricsRegistry = new Registry()
collectDefaultMetrics({ register: metricsRegistry, prefix: 'flexshelf_' })

export const httpRequestDuration = new Histogram({
  name: 'flexshelf_http_request_duration_seconds',
  help: 'HTTP requests by method, route pattern and status, in seconds',
  labelNames: ['method', 'route', 'status'] as const,
  buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30],
  registers: [metricsRegistry],
})

export const computeJobDuration = new Histogram({
  name: 'flexshelf_compute_job_duration_seconds',
  help: 'Compute pool jobs (evaluations, bands, STL, password hashing) by kind and outcome, from submission to answer, in seconds',
  labelNames: ['kind', 'outcome'] as const,
  buckets: [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10],
  registers: [metricsRegistry],
})

interface ComputeQueueProbe {
  /** Jobs waiting for a thread. */
  queued: () => number
  /** Jobs running now. */
  running: () => number
}
let computeProbe: ComputeQueueProbe = { queued: () => 0, running: () => 0 }

/** The compute pool tells the gauges how to read its queue (called once from compute-pool.ts). */
export function setComputeQueueProbe(probe: ComputeQueueProbe): void {
  computeProbe = probe
}

new Gauge({
  name: 'flexshelf_compute_queue_depth',
  help: 'Compute jobs waiting for a worker thread',
  registers: [metricsRegistry],
  collect() {
    this.set(computeProbe.queued())
  },
})

new Gauge({
  name: 'flexshelf_compute_jobs_running',
  help: 'Compute jobs running on worker threads (or on the request thread without a pool)',
  registers: [metricsRegistry],
  collect() {
    this.set(computeProbe.running())
  },
})

const searches = new Counter({
  name: 'flexshelf_searches_total',
  help: 'Searches by force window: direct (POST /api/search) or job (POST /api/searches), answered from the cache or computed',
  labelNames: ['kind', 'cache'] as const,
  registers: [metricsRegistry],
})

export function countSearch(kind: 'direct' | 'job', cached: boolean): void {
  searches.inc({ kind, cache: cached ? 'hit' : 'miss' })
}

const signinFailures = new Counter({
  name: 'flexshelf_signin_failures_total',
  help: 'Failed sign-ins by reason (wrong_credentials, locked, rate_limited, sso)',
  labelNames: ['reason'] as const,
  registers: [metricsRegistry],
})

export function countSigninFailure(reason: 'wrong_credentials' | 'locked' | 'rate_limited' | 'sso'): void {
  signinFailures.inc({ reason })
}
