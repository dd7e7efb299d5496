import { Router, type Request, type Response } from 'express'
import { ipKeyGenerator, rateLimit } from 'express-rate-limit'
import type { AppContext } from '../context'
import { HttpError } from '../errors'
import { currentAuth } from '../middleware/authenticate'
import { allow, allowAnyone } from '../middleware/require-role'
import { signIn, signOut, signUp } from '../services/auth'
import { countSigninFailure } from '../services/metrics'
import { guardStores, normalizeEmail, signinGuard } from '../services/signin-guard'
import { toUserView } from '../services/users'

/** The client address as the rate limits and delays key it (IPv6 by its /56, express-rate-limit's default). */
const clientAddress = (req: Request) => ipKeyGenerator(req.ip ?? '')

function limitHandler(what: string) {
  return (_req: Request, res: Response, next: (err: unknown) => void, options: { windowMs: number }) => {
    // the store's own reset time when it has one; the whole window otherwise
    const resetTime = (res.req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime
    const seconds = Math.max(1, Math.ceil(((resetTime ? resetTime.getTime() - Date.now() : options.windowMs)) / 1000))
    next(new HttpError(429, 'rate_limited', `too many ${what} from your address; try again in ${Math.ceil(seconds / 60)} minute${Math.ceil(seconds / 60) === 1 ? '' : 's'}`, { retryAfterSeconds: seconds }))
  }
}

export function authRouter(context: AppContext): Router {
  const router = Router()
  const stores = guardStores(context)

  // Per client address whatever the e-mail, so made-up e-mails are limited like real ones; only
  // failures count, so an office behind one address signing in all day is never blocked.
  const signinLimiter = rateLimit({
    ...context.config.signinRateLimit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: clientAddress,
    handler: limitHandler('failed sign-in attempts'),
    ...(stores.rateLimit ? { store: stores.rateLimit('signin') } : {}),
  })
  // every sign-up counts: each costs a password hash and makes an account
  const signupLimiter = rateLimit({
    ...context.config.signupRateLimit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: clientAddress,
    handler: limitHandler('sign-ups'),
    ...(stores.rateLimit ? { store: stores.rateLimit('signup') } : {}),
  })

  async function signup(req: Request, res: Response) {
    res.status(201).json(await signUp(context, req.body))
  }

  const guard = signinGuard(context)

  async function signin(req: Request, res: Response) {
    const email = normalizeEmail(req.body?.email)
    const address = clientAddress(req)
    // refused before any password is hashed: a delayed address costs nothing
    if (email) {
      try {
        await guard.assertAllowed(email, address)
      } catch (err) {
        countSigninFailure('rate_limited')
        throw err
      }
    }
    try {
      const session = await signIn(context, req.body)
      if (email) await guard.succeeded(email, address)
      res.json(session)
    } catch (err) {
      // only a wrong password counts; a malformed request is not a guess
      if (email && err instanceof HttpError && err.status === 401) await guard.failed(email, address)
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

  router.post('/signup', allowAnyone(), signupLimiter, signup)
  router.post('/signin', allowAnyone(), signinLimiter, signin)
  router.post('/signout', allow('engineer'), signout)
  router.get('/me', allow('engineer'), me)
  return router
}
