import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { listEntries, parseEntryId, showEntry } from '../services/entries'

export function entriesRouter(context: AppContext): Router {
  const router = Router()

  async function list(req: Request, res: Response) {
    res.json({ entries: await listEntries(context, currentAuth(req).user) })
  }

  async function show(req: Request<{ id: string }>, res: Response) {
    res.json({ entry: await showEntry(context, currentAuth(req).user, parseEntryId(req.params.id)) })
  }

  router.get('/', allow('engineer'), list)
  router.get('/:id', allow('engineer'), show)
  return router
}
