import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow, allowAnyone } from '../middleware/require-role'
import { changePassword } from '../services/password-change'
import { confirmReset, parseResetRequest } from '../services/password-reset'

/** /api/auth: the sign-in options the screen offers, password change and reset. */
export function accountRouter(context: AppContext): Router {
  const router = Router()

  function options(_req: Request, res: Response) {
    const { config } = context
    res.json({
      passwordSignin: config.passwordSignin,
      signup: { open: config.passwordSignin && config.signup.mode === 'open', domains: config.signup.domains },
      sso: config.oidc ? { name: config.oidc.name } : null,
    })
  }

  async function change(req: Request, res: Response) {
    await changePassword(context, currentAuth(req), req.body)
    res.status(204).end()
  }

  function requestReset(req: Request, res: Response) {
    const work = parseResetRequest(context, req.body)
    // answered before the lookup, so neither the answer nor its timing tells who has an account
    res.status(202).json({ status: 'accepted', message: 'if the address has an account here, a reset link is on its way' })
    work().catch((err) => console.error('password reset e-mail failed:', err))
  }

  async function confirm(req: Request, res: Response) {
    await confirmReset(context, req.body)
    res.status(204).end()
  }

  router.get('/options', allowAnyone(), options)
  router.post('/password', allow('engineer'), change)
  router.post('/password-reset', allowAnyone(), requestReset)
  router.post('/password-reset/confirm', allowAnyone(), confirm)
  return router
}
