/**
 * Builds the Express app; starting it is server.ts's job, so tests mount it with supertest.
 * Order: security headers, JSON body parser, deny-by-default sign-in check, resource routers, JSON 404 for
 * /api, the web app, a JSON 404 for everything else, and the one error handler last.
 */
import express, { type Express } from 'express'
import type { Logger } from 'pino'
import type { AppContext } from './context'
import { authenticate } from './middleware/authenticate'
import { bodyDepth } from './middleware/body-depth'
import { errorHandler } from './middleware/error-handler'
import { notFound } from './middleware/not-found'
import { createLogger, requestLog } from './middleware/request-log'
import { securityHeaders } from './middleware/security-headers'
import { apiRouters } from './routes'
import { mountMetrics } from './routes/metrics'
import { serveWebApp } from './web'

export interface AppOptions {
  /** Where server errors are logged (tests capture them). */
  log?: (err: unknown) => void
  /** The JSON request log (pino); one at config.logLevel on stdout when not given. */
  logger?: Logger
}

export function createApp(context: AppContext, options: AppOptions = {}): Express {
  const app = express()
  app.disable('x-powered-by')
  // one hop of reverse proxy at most; the sign-in limit keys on the client address
  app.set('trust proxy', 'loopback')
  app.use(requestLog(options.logger ?? createLogger(context.config.logLevel)))
  app.use(securityHeaders())
  mountMetrics(app, context)

  const api = express.Router()
  api.use(express.json({ limit: context.config.bodyLimit }))
  api.use(bodyDepth())
  api.use(authenticate(context))
  for (const { path, router } of apiRouters(context)) api.use(path, router)
  api.use(notFound)
  app.use('/api', api)

  serveWebApp(app, context.config.webDir)
  app.use(notFound)
  app.use(errorHandler(options.log))
  return app
}
