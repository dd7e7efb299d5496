import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { listOutbox } from '../services/notifications'

/** The notification e-mails as handed to the transport (the local outbox in development and tests). */
export function outboxRouter(context: AppContext): Router {
  const router = Router()

  async function list(_req: Request, res: Response) {
    res.json({ messages: await listOutbox(context) })
  }

  router.get('/', allow('admin'), list)
  return router
}
