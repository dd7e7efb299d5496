import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { validationFailed } from '../errors'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { reviewQueueEntries } from '../services/curation'
import { reviewQueueReports, type QueuePage } from '../services/reports'

const QUEUE_PAGE_DEFAULT = 50
const QUEUE_PAGE_MAX = 100

/** ?limit (1–100, 50 by default) and ?offset (from 0), applied to the entries and the reports alike. */
function parseQueuePage(query: Record<string, unknown>): QueuePage {
  const issues: Array<{ field: string; message: string }> = []
  const read = (key: 'limit' | 'offset', fallback: number, min: number, max: number) => {
    const raw = query[key]
    if (raw === undefined) return fallback
    const n = typeof raw === 'string' && /^\d{1,9}$/.test(raw) ? Number(raw) : NaN
    if (!(n >= min && n <= max)) issues.push({ field: key, message: `${key} must be a whole number from ${min} to ${max}` })
    return n
  }
  const page = { limit: read('limit', QUEUE_PAGE_DEFAULT, 1, QUEUE_PAGE_MAX), offset: read('offset', 0, 0, 1e9) }
  if (issues.length) throw validationFailed(issues)
  return page
}

/** What waits for a librarian: entries and proposals in review, and submitted test reports, a page at a time. */
export function reviewQueueRouter(context: AppContext): Router {
  const router = Router()

  async function list(req: Request, res: Response) {
    const viewer = currentAuth(req).user
    const page = parseQueuePage(req.query as Record<string, unknown>)
    const [entries, reports] = await Promise.all([reviewQueueEntries(context, viewer, page), reviewQueueReports(context, viewer, page)])
    res.json({ entries: entries.items, reports: reports.items, page: { ...page, totalEntries: entries.total, totalReports: reports.total } })
  }

  router.get('/', allow('librarian'), list)
  return router
}
