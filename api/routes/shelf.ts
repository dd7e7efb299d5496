import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { listShelfEntries } from '../services/search'

/** The released shelf in the shape `flexshelf search --shelf <file>` reads. */
export function shelfRouter(context: AppContext): Router {
  const router = Router()

  async function list(_req: Request, res: Response) {
    res.json({ entries: await listShelfEntries(context) })
  }

  router.get('/', allow('engineer'), list)
  return router
}
