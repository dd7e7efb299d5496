import { Router, type Request, type Response } from 'express'
import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import type { AppContext } from '../context'
import { HttpError } from '../errors'
import { currentAuth } from '../middleware/authenticate'
import { allow, allowAnyone } from '../middleware/require-role'
import { signIn, signOut, signUp } from '../services/auth'
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

  async function signin(req: Request, res: Response) {
    res.json(await signIn(context, req.body))
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
