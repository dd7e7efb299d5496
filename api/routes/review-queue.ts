import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { reviewQueueEntries } from '../services/curation'
import { reviewQueueReports } from '../services/reports'

/** What waits for a librarian: entries and proposals in review, and submitted test reports. */
export function reviewQueueRouter(context: AppContext): Router {
  const router = Router()

  async function list(req: Request, res: Response) {
    const viewer = currentAuth(req).user
    res.json({ entries: await reviewQueueEntries(context, viewer), reports: await reviewQueueReports(context, viewer) })
  }

  router.get('/', allow('librarian'), list)
  return router
}
