import { createHash, timingSafeEqual } from 'node:crypto'
import type { Express, Request, Response } from 'express'
import type { AppContext } from '../context'
import { metricsRegistry } from '../services/metrics'

const digest = (s: string) => createHash('sha256').update(s, 'utf8').digest()

/**
 * GET /metrics in the Prometheus text format, open only with FLEXSHELF_METRICS_TOKEN as a
 * bearer token (compared in constant time); without the setting it answers 404.
 */
export function mountMetrics(app: Express, context: AppContext): void {
  const token = context.config.metricsToken
  const expected = token ? digest(token) : null
  app.get('/metrics', async (req: Request, res: Response) => {
    res.locals.route = '/metrics'
    if (!expected) {
      res.status(404).json({ error: { code: 'not_found', message: 'metrics are off here; set FLEXSHELF_METRICS_TOKEN to open /metrics', details: null } })
      return
    }
    const match = /^Bearer (.+)$/.exec(req.get('authorization') ?? '')
    if (!match || !timingSafeEqual(digest(match[1]), expected)) {
      res.status(401).set('WWW-Authenticate', 'Bearer realm="flexshelf-metrics"').json({ error: { code: 'unauthenticated', message: 'metrics need the FLEXSHELF_METRICS_TOKEN as a bearer token', details: null } })
      return
    }
    res.set('Content-Type', metricsRegistry.contentType).send(await metricsRegistry.metrics())
  })
}
