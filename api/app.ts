/**
 * Builds the Express app; starting it is server.ts's job, so tests mount it with supertest.
 * Order: security headers, JSON body parser, deny-by-default sign-in check, resource routers, JSON 404 for
 * /api, the web app, a JSON 404 for everything else, and the one error handler last.
 */
import express, { type Express, type RequestHandler } from 'express'
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
  /**
   * Called with every JSON body the API is about to send, its route ('GET /api/entries/:id')
   * and status; throwing refuses the body (tests hold every answer to the wire contract).
   */
  checkResponse?: (route: string, status: number, body: unknown) => void
}

/** Wraps res.send so each JSON body (res.json sends through it) passes `check` before it goes out. */
function checkedResponses(check: NonNullable<AppOptions['checkResponse']>): RequestHandler {
  return (req, res, next) => {
    const send = res.send.bind(res)
    res.send = (body?: unknown) => {
      if (typeof body === 'string' && /application\/json/.test(String(res.get('Content-Type') ?? ''))) {
        const route = req.route ? `${req.method} ${req.baseUrl}${req.route.path === '/' ? '' : req.route.path}` : `${req.method} ${req.originalUrl.split('?')[0]}`
        check(route, res.statusCode, JSON.parse(body))
      }
      return send(body)
    }
    next()
  }
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
  if (options.checkResponse) api.use(checkedResponses(options.checkResponse))
  api.use(authenticate(context))
  for (const { path, router } of apiRouters(context)) api.use(path, router)
  api.use(notFound)
  app.use('/api', api)

  serveWebApp(app, context.config.webDir)
  app.use(notFound)
  app.use(errorHandler(options.log))
  return app
}
