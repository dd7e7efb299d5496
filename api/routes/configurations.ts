/**
 * Saved configurations (owner only; anyone else gets 404) and their read-only shared view by
 * link token (any signed-in user). Both offer the check and the downloads of what was saved.
 */
import { Router, type NextFunction, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { checkTarget } from '../services/configure'
import {
  createConfiguration, deleteConfiguration, listOwn, openOwn, openShared, parseConfigurationId, resolveSaved, shareConfiguration,
  unshareConfiguration, type OpenedConfiguration,
} from '../services/configurations'
import { curveCsvFile, partFile, stlFile } from '../services/downloads'
import { PART_FORMATS, type PartFormat } from '../../catalog'
import { sendDatasheet, sendDatasheetPdf, sendFile } from './send-files'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set by the configuration routers' router.param loaders. */
      configuration?: OpenedConfiguration
    }
  }
}

function load(req: Request, next: NextFunction, open: () => Promise<OpenedConfiguration>): void {
  Promise.resolve()
    .then(open)
    .then((configuration) => {
      req.configuration = configuration
      next()
    }, next)
}

function opened(req: Request): OpenedConfiguration {
  return req.configuration!
}

/** The check and the downloads (STL, 3MF, DXF, SVG, curve CSV, data sheet), the same for an owner's and a shared configuration. */
function addReadRoutes(router: Router, param: string) {
  const input = (req: Request) => {
    const { target } = opened(req)
    return { target, input: resolveSaved(opened(req)), configuration: { id: opened(req).view.id, name: opened(req).view.name } }
  }
  router.get(`/:${param}/check`, allow('engineer'), async function check(req: Request, res: Response) {
    const { target, input: resolved } = input(req)
    res.json(await checkTarget(target, resolved))
  })
  router.get(`/:${param}/stl`, allow('engineer'), async function stl(req: Request, res: Response) {
    const { target, input: resolved } = input(req)
    sendFile(res, await stlFile(target, resolved))
  })
  for (const format of Object.keys(PART_FORMATS) as PartFormat[]) {
    router.get(`/:${param}/${format}`, allow('engineer'), async function part(req: Request, res: Response) {
      const { target, input: resolved } = input(req)
      sendFile(res, await partFile(format, target, resolved))
    })
  }
  router.get(`/:${param}/curve.csv`, allow('engineer'), async function curveCsv(req: Request, res: Response) {
    const { target, input: resolved } = input(req)
    sendFile(res, await curveCsvFile(target, resolved))
  })
  router.get(`/:${param}/datasheet`, allow('engineer'), async function datasheet(req: Request, res: Response) {
    const { target, input: resolved, configuration } = input(req)
    await sendDatasheet(res, target, resolved, { configuration })
  })
  router.get(`/:${param}/datasheet.pdf`, allow('engineer'), async function datasheetPdf(req: Request, res: Response) {
    const { target, input: resolved, configuration } = input(req)
    await sendDatasheetPdf(res, target, resolved, { configuration })
  })
}

export function configurationsRouter(context: AppContext): Router {
  const router = Router()

  // the owner's configuration or 404, before any handler runs
  router.param('id', (req: Request, _res: Response, next: NextFunction, raw: string) => {
    // router.param does not await: hand a failure to next() ourselves
    load(req, next, () => openOwn(context, currentAuth(req).user, parseConfigurationId(raw)))
  })

  async function list(req: Request, res: Response) {
    res.json({ configurations: await listOwn(context, currentAuth(req).user) })
  }

  async function create(req: Request, res: Response) {
    res.status(201).json({ configuration: await createConfiguration(context, currentAuth(req).user, req.body) })
  }

  function show(req: Request, res: Response) {
    res.json({ configuration: opened(req).view })
  }

  async function remove(req: Request, res: Response) {
    await deleteConfiguration(context, currentAuth(req).user, opened(req).view.id)
    res.status(204).end()
  }

  async function share(req: Request, res: Response) {
    res.json(await shareConfiguration(context, currentAuth(req).user, opened(req).view.id))
  }

  async function unshare(req: Request, res: Response) {
    await unshareConfiguration(context, currentAuth(req).user, opened(req).view.id)
    res.status(204).end()
  }

  router.get('/', allow('engineer'), list)
  router.post('/', allow('engineer'), create)
  router.get('/:id', allow('engineer'), show)
  router.delete('/:id', allow('engineer'), remove)
  router.post('/:id/share', allow('engineer'), share)
  router.delete('/:id/share', allow('engineer'), unshare)
  addReadRoutes(router, 'id')
  return router
}

/** Read-only: a share token opens the configuration, its check and its downloads, nothing else. */
export function sharedRouter(context: AppContext): Router {
  const router = Router()

  router.param('token', (req: Request, _res: Response, next: NextFunction, token: string) => {
    load(req, next, () => openShared(context, currentAuth(req).user, token))
  })

  router.get('/:token', allow('engineer'), function show(req: Request, res: Response) {
    res.json({ configuration: opened(req).view })
  })
  addReadRoutes(router, 'token')
  return router
}
