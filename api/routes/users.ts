import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { unlockUser } from '../services/signin-guard'
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

  async function unlock(req: Request<{ id: string }>, res: Response) {
    res.json(await unlockUser(context, currentAuth(req).user, parseUserId(req.params.id)))
  }

  router.get('/', allow('admin'), list)
  router.post('/:id/unlock', allow('admin'), unlock)
  router.patch('/:id/role', allow('admin'), updateRole)
  return router
}
