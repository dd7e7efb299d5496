/** Comparing up to four results or saved configurations: the JSON the Compare screen shows, as CSV and as a PDF page. */
import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { buildComparison, comparisonCsv, parseCompareQuery } from '../services/comparison'
import { renderComparisonPdf } from '../services/comparison-pdf'

export function compareRouter(context: AppContext): Router {
  const router = Router()
  const load = (req: Request) => buildComparison(context, currentAuth(req).user, parseCompareQuery(req.query as Record<string, unknown>))
  const attach = (res: Response, name: string, type: string) => {
    res.set('Content-Disposition', `attachment; filename="${name}"`)
    res.set('Content-Type', type)
    res.set('Cache-Control', 'private, no-cache')
  }

  router.get('/', allow('engineer'), async function compare(req: Request, res: Response) {
    res.json({ comparison: await load(req) })
  })
  router.get('/csv', allow('engineer'), async function compareCsv(req: Request, res: Response) {
    const comparison = await load(req)
    attach(res, `flexshelf-comparison-${comparison.candidates.length}.csv`, 'text/csv; charset=utf-8')
    res.send(comparisonCsv(comparison))
  })
  router.get('/pdf', allow('engineer'), async function comparePdf(req: Request, res: Response) {
    const comparison = await load(req)
    attach(res, `flexshelf-comparison-${comparison.candidates.length}.pdf`, 'application/pdf')
    res.send(await renderComparisonPdf(comparison))
  })
  return router
}
