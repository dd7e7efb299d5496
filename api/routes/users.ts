import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { changeRole, listUsers, parseUserId } from '../services/users'

export function usersRouter(context: AppContext): Router {
  const router = Router()

  async function list(_req: Request, res: Response) {
    res.json({ users: await listUsers(context) })
  }

  async function updateRole(req: Request<{ id: string }>, res: Response) {
    const user = await changeRole(context, currentAuth(req).user, parseUserId(req.params.id), req.body)
    res.json({ user })
  }

  router.get('/', allow('admin'), list)
  router.patch('/:id/role', allow('admin'), updateRole)
  return router
}
