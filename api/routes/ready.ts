import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allowAnyone } from '../middleware/require-role'
import { readinessChecks, runReadiness } from '../services/readiness'

/** GET /api/ready: 200 when every dependency answers, 503 naming the one that does not. */
export function readyRouter(context: AppContext): Router {
  const router = Router()

  async function show(_req: Request, res: Response) {
    const { ready, checks } = await runReadiness(readinessChecks(context))
    res.status(ready ? 200 : 503).set('Cache-Control', 'no-store').json({ status: ready ? 'ready' : 'not_ready', checks })
  }

  router.get('/', allowAnyone(), show)
  return router
}
