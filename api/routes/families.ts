import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { evaluateFamily } from '../services/evaluation'
import { findFamily, listFamilies, toFamilyView } from '../services/families'

export function familiesRouter(context: AppContext): Router {
  const router = Router()

  function list(_req: Request, res: Response) {
    res.json({ families: listFamilies() })
  }

  function show(req: Request<{ id: string }>, res: Response) {
    res.json({ family: toFamilyView(findFamily(req.params.id)) })
  }

  async function evaluate(req: Request<{ id: string }>, res: Response) {
    res.json(await evaluateFamily(context, req.params.id, req.body))
  }

  router.get('/', allow('engineer'), list)
  router.get('/:id', allow('engineer'), show)
  router.post('/:id/evaluate', allow('engineer'), evaluate)
  return router
}
