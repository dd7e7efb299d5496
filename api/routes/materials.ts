import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { listMaterials } from '../services/materials'

export function materialsRouter(context: AppContext): Router {
  const router = Router()

  async function list(_req: Request, res: Response) {
    res.json({ materials: await listMaterials(context) })
  }

  router.get('/', allow('engineer'), list)
  return router
}
