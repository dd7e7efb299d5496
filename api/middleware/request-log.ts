/**
 * One JSON line per request (pino-http): request id, method, URL, route pattern, status,
 * duration and the signed-in user's id. Never a token, a password or a reset link: headers
 * and bodies are not logged, query values are replaced by [redacted], and a path segment that
 * looks like a token (20+ URL-safe characters, as in /shared/<token>) is too. The same finish
 * event feeds the request-duration histogram of /metrics.
 */
import { randomUUID } from 'node:crypto'
import type { IncomingMessage, ServerResponse } from 'node:http'
import type { NextFunction, Request, RequestHandler, Response } from 'express'
import pino, { type Logger } from 'pino'
import { pinoHttp } from 'pino-http'
import { httpRequestDuration } from '../services/metrics'

const TOKEN_LIKE = /^[A-Za-z0-9_-]{20,}$/
const REQUEST_ID = /^[A-Za-z0-9._-]{1,64}$/

/** The URL as it may be logged: query values and token-like path segments replaced. */
function loggableUrl(url: string): string {
  const [path, query] = url.split('?', 2)
  const safePath = path.split('/').map((segment) => (TOKEN_LIKE.test(segment) ? '[redacted]' : segment)).join('/')
  if (query === undefined) return safePath
  const keys = query.split('&').filter(Boolean).map((pair) => `${encodeURIComponent(decodeURIComponentSafe(pair.split('=')[0]))}=[redacted]`)
  return `${safePath}?${keys.join('&')}`
}

function decodeURIComponentSafe(s: string): string {
  try {
    return decodeURIComponent(s)
  } catch {
    return s
  }
}

/** The route pattern the request matched (set by the role gates), or what it was instead. */
function routeLabel(req: Request, res: Response): string {
  const route = res.locals.route as string | undefined
  if (route) return route
  if (req.originalUrl === '/metrics') return '/metrics'
  return req.originalUrl.startsWith('/api') ? '/api (no route)' : '(web app)'
}

export function createLogger(level: string): Logger {
  return pino({ level, base: { service: 'flexshelf' }, timestamp: pino.stdTimeFunctions.isoTime })
}

export function requestLog(logger: Logger): RequestHandler[] {
  const http = pinoHttp<IncomingMessage, ServerResponse>({
    logger,
    genReqId: (req, res) => {
      const given = req.headers['x-request-id']
      const id = typeof given === 'string' && REQUEST_ID.test(given) ? given : randomUUID()
      res.setHeader('X-Request-Id', id)
      return id
    },
    serializers: {
      req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, url: loggableUrl(req.url) }),
      res: (res: { statusCode: number }) => ({ status: res.statusCode }),
    },
    // bound when the response is done, so the route and the user are known
    customProps: (req, res) => {
      if (!res.writableEnded) return {}
      const r = req as Request
      return { route: routeLabel(r, res as Response), userId: r.auth?.user.id ?? null }
    },
    customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    customSuccessMessage: (req, res) => `${req.method} ${routeLabel(req as Request, res as Response)} ${res.statusCode}`,
    customErrorMessage: (req, res) => `${req.method} ${routeLabel(req as Request, res as Response)} ${res.statusCode}`,
    customAttributeKeys: { responseTime: 'durationMs' },
  })
  function measure(req: Request, res: Response, next: NextFunction) {
    const stop = httpRequestDuration.startTimer()
    res.on('finish', () => stop({ method: req.method, route: routeLabel(req, res), status: String(res.statusCode) }))
    next()
  }
  return [http as unknown as RequestHandler, measure]
}
