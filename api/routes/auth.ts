import { Router, type Request, type Response } from 'express'
import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import type { AppContext } from '../context'
import { HttpError } from '../errors'
import { currentAuth } from '../middleware/authenticate'
import { allow, allowAnyone } from '../middleware/require-role'
import { signIn, signOut, signUp } from '../services/auth'
import { normalizeEmail, SigninLockout } from '../services/signin-lockout'
import { toUserView } from '../services/users'

export function authRouter(context: AppContext): Router {
  const router = Router()
  const { windowMs, limit } = context.config.signinRateLimit

  // Per address and e-mail, so one person guessing cannot lock out a whole office behind
  // one NAT; only failed attempts count, so a team signing in all day is never blocked.
  const signinLimiter = rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : ''
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`
    },
    handler: (_req, _res, next, options) => {
      const retryAfter = Math.ceil(options.windowMs / 1000)
      next(new HttpError(429, 'rate_limited', `too many sign-in attempts; try again in ${Math.ceil(retryAfter / 60)} minutes`, { retryAfterSeconds: retryAfter }))
    },
  })

  async function signup(req: Request, res: Response) {
    res.status(201).json(await signUp(context, req.body))
  }

  const lockout = new SigninLockout(context.config.signinLockout)

  async function signin(req: Request, res: Response) {
    const email = normalizeEmail(req.body?.email)
    if (email) {
      try {
        lockout.assertOpen(email)
      } catch (err) {
        if (err instanceof HttpError && err.details) res.set('Retry-After', String(err.details.retryAfterSeconds))
        throw err
      }
    }
    try {
      const session = await signIn(context, req.body)
      if (email) lockout.succeeded(email)
      res.json(session)
    } catch (err) {
      // only a wrong password counts; a malformed request is not a guess
      if (email && err instanceof HttpError && err.status === 401) lockout.failed(email)
      throw err
    }
  }

  async function signout(req: Request, res: Response) {
    await signOut(context, currentAuth(req))
    res.status(204).end()
  }

  function me(req: Request, res: Response) {
    res.json({ user: toUserView(currentAuth(req).user) })
  }

  router.post('/signup', allowAnyone(), signup)
  router.post('/signin', allowAnyone(), signinLimiter, signin)
  router.post('/signout', allow('engineer'), signout)
  router.get('/me', allow('engineer'), me)
  return router
}
