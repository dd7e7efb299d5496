import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { HttpError } from '../errors'
import { allowAnyone } from '../middleware/require-role'
import { authenticateToken } from '../services/auth'
import { countSsoFailure, finishSignin, FLOW_TTL_SECONDS, requireOidc, SsoError, startSignin } from '../services/oidc'
import { toUserView } from '../services/users'

const FLOW_COOKIE = 'flexshelf_oidc'
const SESSION_COOKIE = 'flexshelf_sso'
/** The session token waits this long in its cookie for the web app to collect it. */
const SESSION_HANDOVER_SECONDS = 120

function readCookie(req: Request, name: string): string | undefined {
  for (const part of (req.get('cookie') ?? '').split(';')) {
    const [k, ...v] = part.trim().split('=')
    if (k === name) return decodeURIComponent(v.join('='))
  }
  return undefined
}

/** /api/auth/oidc: start, callback, and the hand-over of the session token to the web app. */
export function oidcRouter(context: AppContext): Router {
  const router = Router()
  const secure = context.config.publicUrl.startsWith('https:')
  const cookie = (path: string, maxAge: number) => ({ httpOnly: true, sameSite: 'lax' as const, secure, path, maxAge: maxAge * 1000 })

  async function start(req: Request, res: Response) {
    requireOidc(context)
    const { url, flowCookie } = await startSignin(context, req.query.next)
    res.cookie(FLOW_COOKIE, flowCookie, cookie('/api/auth/oidc', FLOW_TTL_SECONDS)).redirect(302, url)
  }

  async function callback(req: Request, res: Response) {
    requireOidc(context)
    const query = new URLSearchParams(req.url.split('?')[1] ?? '')
    res.clearCookie(FLOW_COOKIE, { path: '/api/auth/oidc' })
    try {
      const { token, next } = await finishSignin(context, query, readCookie(req, FLOW_COOKIE))
      res.cookie(SESSION_COOKIE, token, cookie('/api/auth/oidc/session', SESSION_HANDOVER_SECONDS))
        .redirect(302, `/signin?sso=done&redirect=${encodeURIComponent(next)}`)
    } catch (err) {
      if (!(err instanceof SsoError)) throw err
      countSsoFailure()
      res.redirect(302, `/signin?sso_error=${err.code}`)
    }
  }

  /** The web app collects the session once; a bearer token then, like a password sign-in. */
  async function session(req: Request, res: Response) {
    requireOidc(context)
    const token = readCookie(req, SESSION_COOKIE)
    res.clearCookie(SESSION_COOKIE, { path: '/api/auth/oidc/session' })
    if (!token) throw new HttpError(401, 'unauthenticated', 'no single sign-on is waiting to be collected; sign in again')
    const auth = await authenticateToken(context, token)
    res.set('Cache-Control', 'no-store').json({ token, user: toUserView(auth.user) })
  }

  router.get('/start', allowAnyone(), start)
  router.get('/callback', allowAnyone(), callback)
  router.post('/session', allowAnyone(), session)
  return router
}
