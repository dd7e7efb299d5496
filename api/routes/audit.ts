import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { allow } from '../middleware/require-role'
import { auditActions, auditCsv, listAuditEvents, parseAuditFilter } from '../services/audit'

export function auditRouter(context: AppContext): Router {
  const router = Router()

  async function list(req: Request, res: Response) {
    const filter = parseAuditFilter(req.query)
    res.json({ events: await listAuditEvents(context, filter), actions: await auditActions(context) })
  }

  async function exportCsv(req: Request, res: Response) {
    const filter = parseAuditFilter(req.query)
    const csv = auditCsv(await listAuditEvents(context, { limit: 5000, ...filter }))
    const day = new Date().toISOString().slice(0, 10)
    res.set({ 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="flexshelf-audit-${day}.csv"` }).send(csv)
  }

  router.get('/', allow('admin'), list)
  router.get('/csv', allow('admin'), exportCsv)
  return router
}
