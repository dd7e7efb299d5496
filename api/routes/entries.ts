import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { listEntries, parseEntryId, showEntry } from '../services/entries'
import { readCache } from '../services/read-cache'
import { hasRole } from '../roles'
import type { User } from '../db'

/** Viewers who get the same shelf list (services/entries.ts visibleTo): all engineers, each contributor, all librarians and admins. */
function listAudience(user: User): string {
  if (hasRole(user.role, 'librarian')) return 'staff'
  return hasRole(user.role, 'contributor') ? `contributor ${user.id}` : 'published'
}

/** An entry page also shows the viewer's own test reports and drafts, so only staff share one. */
function entryAudience(user: User): string {
  return hasRole(user.role, 'librarian') ? 'staff' : `user ${user.id} ${user.role}`
}

export function entriesRouter(context: AppContext): Router {
  const router = Router()

  // the shelf list and entry pages are the busiest reads: their JSON is kept until a table
  // they come from changes (read-cache.ts), per group of viewers who see the same answer
  async function list(req: Request, res: Response) {
    const user = currentAuth(req).user
    const body = await readCache(context.db).read('entries', listAudience(user), ['Entry', 'EntryRevision', 'User'], async () =>
      JSON.stringify({ entries: await listEntries(context, user) }))
    res.type('application/json').send(body)
  }

  async function show(req: Request<{ id: string }>, res: Response) {
    const user = currentAuth(req).user
    const id = parseEntryId(req.params.id)
    const body = await readCache(context.db).read('entry', `${id}|${entryAudience(user)}`, ['Entry', 'EntryRevision', 'User', 'TestReport', 'EntryComment', 'Material'], async () =>
      JSON.stringify({ entry: await showEntry(context, user, id) }))
    res.type('application/json').send(body)
  }

  router.get('/', allow('engineer'), list)
  router.get('/:id', allow('engineer'), show)
  return router
}
