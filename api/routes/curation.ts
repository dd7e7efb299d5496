/** Drafts, change proposals, comments, review decisions and diffs of entries (mounted at /entries). */
import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { addComment, changeStatus, compareRevisions, createDraft, createProposal, entryDiff, updateDraft } from '../services/curation'
import { parseEntryId } from '../services/entries'

type Action = Parameters<typeof changeStatus>[3]

export function curationRouter(context: AppContext): Router {
  const router = Router()

  async function create(req: Request, res: Response) {
    res.status(201).json({ entry: await createDraft(context, currentAuth(req).user, req.body) })
  }

  async function update(req: Request<{ id: string }>, res: Response) {
    res.json({ entry: await updateDraft(context, currentAuth(req).user, parseEntryId(req.params.id), req.body) })
  }

  async function propose(req: Request<{ id: string }>, res: Response) {
    res.status(201).json({ entry: await createProposal(context, currentAuth(req).user, parseEntryId(req.params.id), req.body) })
  }

  async function comment(req: Request<{ id: string }>, res: Response) {
    res.status(201).json({ comment: await addComment(context, currentAuth(req).user, parseEntryId(req.params.id), req.body) })
  }

  const transition = (action: Action) => async function changeEntryStatus(req: Request<{ id: string }>, res: Response) {
    res.json({ entry: await changeStatus(context, currentAuth(req).user, parseEntryId(req.params.id), action, req.body) })
  }

  async function diff(req: Request<{ id: string }>, res: Response) {
    res.json({ diff: await entryDiff(context, currentAuth(req).user, parseEntryId(req.params.id), req.query.against) })
  }

  async function compare(req: Request<{ id: string }>, res: Response) {
    res.json({ comparison: await compareRevisions(context, currentAuth(req).user, parseEntryId(req.params.id), req.query as Record<string, unknown>) })
  }

  router.post('/', allow('contributor'), create)
  router.patch('/:id', allow('contributor'), update)
  router.post('/:id/proposals', allow('contributor'), propose)
  router.post('/:id/comments', allow('contributor'), comment)
  router.post('/:id/submit', allow('contributor'), transition('submit'))
  router.post('/:id/release', allow('librarian'), transition('release'))
  router.post('/:id/reject', allow('librarian'), transition('reject'))
  router.post('/:id/request-changes', allow('librarian'), transition('request-changes'))
  router.post('/:id/retire', allow('librarian'), transition('retire'))
  router.get('/:id/diff', allow('engineer'), diff)
  router.get('/:id/revisions/compare', allow('engineer'), compare)
  return router
}
