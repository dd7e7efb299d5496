/**
 * Deny by default: every /api request needs a valid bearer token, except the few routes
 * on the public list. Unknown routes are refused too (401 before 404), so nothing new is
 * ever reachable anonymously by accident.
 */
import type { NextFunction, Request, RequestHandler, Response } from 'express'
import type { AppContext } from '../context'
import { HttpError, unauthenticated } from '../errors'
import { authenticateToken, type Authenticated } from '../services/auth'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set by authenticate for every non-public request. */
      auth?: Authenticated
    }
  }
}

/** method + path (relative to /api) of the routes that need no sign-in. */
const PUBLIC_ROUTES: ReadonlyArray<{ method: string; path: string }> = [
  { method: 'GET', path: '/health' },
  { method: 'POST', path: '/auth/signup' },
  { method: 'POST', path: '/auth/signin' },
  { method: 'GET', path: '/auth/options' },
  { method: 'POST', path: '/auth/password-reset' },
  { method: 'POST', path: '/auth/password-reset/confirm' },
  { method: 'GET', path: '/auth/oidc/start' },
  { method: 'GET', path: '/auth/oidc/callback' },
  { method: 'POST', path: '/auth/oidc/session' },
  { method: 'GET', path: '/ready' },
]

/** What a user with a one-time password may do before choosing their own. */
const BEFORE_PASSWORD_CHANGE: ReadonlyArray<{ method: string; path: string }> = [
  { method: 'GET', path: '/auth/me' },
  { method: 'POST', path: '/auth/password' },
  { method: 'POST', path: '/auth/signout' },
]

function listed(req: Request, list: ReadonlyArray<{ method: string; path: string }>): boolean {
  const method = req.method === 'HEAD' ? 'GET' : req.method
  const path = req.path.length > 1 ? req.path.replace(/\/+$/, '') : req.path
  return list.some((r) => r.method === method && r.path === path)
}

const isPublic = (req: Request) => listed(req, PUBLIC_ROUTES)

const BEARER = /^Bearer ([A-Za-z0-9_\-.]+)$/

export function authenticate(context: AppContext): RequestHandler {
  return async function authenticateRequest(req: Request, _res: Response, next: NextFunction) {
    if (isPublic(req)) return next()
    const header = req.get('authorization')
    if (!header) throw unauthenticated('sign in first (no Authorization: Bearer token)')
    const match = BEARER.exec(header)
    if (!match) throw unauthenticated('the Authorization header must be "Bearer <token>"')
    req.auth = await authenticateToken(context, match[1])
    if (req.auth.user.passwordMustChange && !listed(req, BEFORE_PASSWORD_CHANGE)) {
      throw new HttpError(403, 'password_change_required', 'choose your own password first: this account still has the one-time password it was given (POST /api/auth/password)')
    }
    next()
  }
}

/** The signed-in user of a request that passed authenticate. */
export function currentAuth(req: Request): Authenticated {
  if (!req.auth) throw unauthenticated()
  return req.auth
}
