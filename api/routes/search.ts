import { Router, type Request, type Response } from 'express'
import type { AppContext } from '../context'
import { currentAuth } from '../middleware/authenticate'
import { toHttpError } from '../middleware/error-handler'
import { allow } from '../middleware/require-role'
import { countSearch } from '../services/metrics'
import { searchService, type JobEvent } from '../services/search'

/** Comment lines keep idle event streams open through proxies, ms. */
const HEARTBEAT_MS = 15_000

/** POST /api/search: one search answered in the response. */
export function searchRouter(context: AppContext): Router {
  const router = Router()
  const service = searchService(context)

  async function search(req: Request, res: Response) {
    const leaving = new AbortController()
    res.on('close', () => { if (!res.writableFinished) leaving.abort() })
    const { answer, cached } = await service.search(currentAuth(req).user.id, req.body, leaving.signal)
    countSearch('direct', cached)
    res.set('Flexshelf-Cache', cached ? 'hit' : 'miss').json(answer)
  }

  router.post('/', allow('engineer'), search)
  return router
}

/** /api/searches: search jobs with progress as server-sent events, and cancellation. */
export function searchesRouter(context: AppContext): Router {
  const router = Router()
  const service = searchService(context)

  async function start(req: Request, res: Response) {
    const job = await service.start(currentAuth(req).user.id, req.body)
    countSearch('job', job.cached)
    res.status(202).json({ id: job.id, status: job.status, cached: job.cached })
  }

  async function status(req: Request<{ id: string }>, res: Response) {
    res.json(service.view(await service.job(currentAuth(req).user.id, req.params.id)))
  }

  async function events(req: Request<{ id: string }>, res: Response) {
    const job = await service.job(currentAuth(req).user.id, req.params.id)
    res.status(200).set({ 'Content-Type': 'text/event-stream; charset=utf-8', 'Cache-Control': 'no-cache, no-transform', Connection: 'keep-alive', 'X-Accel-Buffering': 'no' })
    res.flushHeaders()
    let closed = false
    let stop = () => {}
    res.on('close', () => { closed = true; clearInterval(heartbeat); stop() })
    const send = ({ event, data }: JobEvent) => {
      if (closed) return
      res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`)
      if (event !== 'progress') res.end()
    }
    const heartbeat = setInterval(() => res.write(': still searching\n\n'), HEARTBEAT_MS)
    try {
      const unsubscribe = await service.follow(job, send)
      // the browser may have left while the job was being read
      if (closed) unsubscribe()
      else stop = unsubscribe
    } catch (err) {
      // the stream has begun, so the error goes as its final event rather than a status
      const http = toHttpError(err)
      if (http.status >= 500) console.error(err)
      send({ event: 'error', data: { error: { code: http.code, message: http.message, details: http.details } } })
    }
  }

  async function cancel(req: Request<{ id: string }>, res: Response) {
    await service.cancel(await service.job(currentAuth(req).user.id, req.params.id))
    res.status(204).end()
  }

  router.post('/', allow('engineer'), start)
  router.get('/:id', allow('engineer'), status)
  router.get('/:id/events', allow('engineer'), events)
  router.delete('/:id', allow('engineer'), cancel)
  return router
}
