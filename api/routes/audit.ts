import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { listAuditEvents } from '../services/audit'

export function auditRouter(context: AppContext): Router {
  const router = Router()

  async function list(_req: Request, res: Response) {
    res.json({ events: await listAuditEvents(context) })
  }

  router.get('/', allow('admin'), list)
  return router
}
