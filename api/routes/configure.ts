/**
 * Configuring a shelf entry: the check the configure screen runs as parameters change, and
 * the files taken away (STL, 3MF, DXF and SVG of the profile, curve CSV, data sheet as PDF and as JSON for the printable page).
 * Downloads take the configuration in the query; see docs/api.md.
 */
import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { configurationBody, parseConfigurationQuery, type ConfigurationInput, type RawConfiguration } from '../services/configuration-input'
import { checkTarget, configureTarget, loadEntry, resolveFor, type ConfigureTarget } from '../services/configure'
import { curveCsvFile, partFile, stlFile } from '../services/downloads'
import { PART_FORMATS, type PartFormat } from '../../catalog'
import { parseEntryId } from '../services/entries'
import { parseBody } from '../validation'
import { sendDatasheet, sendDatasheetPdf, sendFile } from './send-files'

export function configureRouter(context: AppContext): Router {
  const router = Router()

  async function prepare(req: Request<{ id: string }>, raw: RawConfiguration): Promise<{ target: ConfigureTarget; input: ConfigurationInput }> {
    const entry = await loadEntry(context, currentAuth(req).user, parseEntryId(req.params.id))
    const target = await configureTarget(context, entry)
    return { target, input: resolveFor(target, raw) }
  }

  const fromQuery = (req: Request<{ id: string }>) => prepare(req, parseConfigurationQuery(req.query as Record<string, unknown>))

  async function check(req: Request<{ id: string }>, res: Response) {
    const { target, input } = await prepare(req, parseBody(configurationBody, req.body))
    res.json(await checkTarget(target, input))
  }

  async function stl(req: Request<{ id: string }>, res: Response) {
    const { target, input } = await fromQuery(req)
    sendFile(res, await stlFile(target, input))
  }

  async function curveCsv(req: Request<{ id: string }>, res: Response) {
    const { target, input } = await fromQuery(req)
    sendFile(res, await curveCsvFile(target, input))
  }

  async function datasheet(req: Request<{ id: string }>, res: Response) {
    const { target, input } = await fromQuery(req)
    await sendDatasheet(res, target, input)
  }

  async function datasheetPdf(req: Request<{ id: string }>, res: Response) {
    const { target, input } = await fromQuery(req)
    await sendDatasheetPdf(res, target, input)
  }

  router.post('/:id/check', allow('engineer'), check)
  router.get('/:id/stl', allow('engineer'), stl)
  for (const format of Object.keys(PART_FORMATS) as PartFormat[]) {
    router.get(`/:id/${format}`, allow('engineer'), async function part(req: Request<{ id: string }>, res: Response) {
      const { target, input } = await fromQuery(req)
      sendFile(res, await partFile(format, target, input))
    })
  }
  router.get('/:id/curve.csv', allow('engineer'), curveCsv)
  router.get('/:id/datasheet', allow('engineer'), datasheet)
  router.get('/:id/datasheet.pdf', allow('engineer'), datasheetPdf)
  return router
}
