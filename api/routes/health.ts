import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allowAnyone } from '../middleware/require-role'

export function healthRouter(context: AppContext): Router {
  const router = Router()

  async function show(_req: Request, res: Response) {
    let database = 'ok'
    try {
      await context.db.sequelize.query('SELECT 1')
    } catch {
      database = 'unavailable'
    }
    res.status(database === 'ok' ? 200 : 503).json({ status: database === 'ok' ? 'ok' : 'degraded', version: context.config.version, database })
  }

  router.get('/', allowAnyone(), show)
  return router
}
