/** Test reports: upload and calibration under /entries/:id, review and downloads under /reports/:id. */
import { pipeline } from 'node:stream/promises'
import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express'
import multer from 'multer'
import type { AppContext } from '../context'
import { HttpError, validationFailed } from '../errors'
import { currentAuth } from '../middleware/authenticate'
import { allow } from '../middleware/require-role'
import { parseEntryId } from '../services/entries'
import { adoptModulus, createReport, entryCalibration, parseReportId, reportCurve, reportDownload, reviewReport, type UploadedFile } from '../services/reports'

/** multer in memory: nothing reaches the disk before the report is checked and stored. */
function uploadFiles(context: AppContext): RequestHandler {
  const { csvBytes, photoBytes } = context.config.uploadLimits
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: Math.max(csvBytes, photoBytes), files: 2, fields: 20, fieldSize: 10000, parts: 24 },
  }).fields([{ name: 'file', maxCount: 1 }, { name: 'photo', maxCount: 1 }])
  return function receiveFiles(req: Request, res: Response, next: NextFunction) {
    upload(req, res, (err: unknown) => {
      if (!err) return next()
      if (err instanceof multer.MulterError) {
        const field = err.field ?? 'file'
        if (err.code === 'LIMIT_FILE_SIZE') {
          const limit = field === 'photo' ? photoBytes : csvBytes
          return next(new HttpError(413, 'payload_too_large', `${field} is larger than the limit of ${Math.round(limit / 1024 / 1024 * 10) / 10} MB`, { field, limit }))
        }
        if (err.code === 'LIMIT_UNEXPECTED_FILE') return next(validationFailed([{ field, message: `${field} is not an accepted file field (send the CSV as "file" and an optional "photo")` }]))
        return next(validationFailed([{ field, message: `${field}: ${err.message}` }]))
      }
      next(err)
    })
  }
}

function filesOf(req: Request): { file?: UploadedFile; photo?: UploadedFile } {
  const files = (req.files ?? {}) as Record<string, UploadedFile[]>
  return { file: files.file?.[0], photo: files.photo?.[0] }
}

export function entryReportsRouter(context: AppContext): Router {
  const router = Router()

  async function create(req: Request<{ id: string }>, res: Response) {
    res.status(201).json({ report: await createReport(context, currentAuth(req).user, parseEntryId(req.params.id), req.body, filesOf(req)) })
  }

  async function calibration(req: Request<{ id: string }>, res: Response) {
    res.json({ calibration: await entryCalibration(context, currentAuth(req).user, parseEntryId(req.params.id)) })
  }

  router.post('/:id/reports', allow('contributor'), uploadFiles(context), create)
  router.get('/:id/calibration', allow('engineer'), calibration)
  return router
}

export function reportsRouter(context: AppContext): Router {
  const router = Router()

  const review = (decision: 'accepted' | 'rejected') => async function decide(req: Request<{ id: string }>, res: Response) {
    res.json({ report: await reviewReport(context, currentAuth(req).user, parseReportId(req.params.id), decision, req.body) })
  }

  const download = (which: 'file' | 'photo') => async function send(req: Request<{ id: string }>, res: Response) {
    const { body, contentType, filename } = await reportDownload(context, currentAuth(req).user, parseReportId(req.params.id), which)
    res.set({
      'Content-Type': contentType,
      'Content-Disposition': `attachment; filename="${filename}"`,
      'X-Content-Type-Options': 'nosniff',
      'Cache-Control': 'private, no-store',
    })
    if (Buffer.isBuffer(body)) {
      res.send(body)
      return
    }
    // a stream from the store: a failure after the headers went out can only cut the answer short
    await pipeline(body, res)
  }

  async function adopt(req: Request<{ id: string }>, res: Response) {
    res.status(201).json({ material: await adoptModulus(context, currentAuth(req).user, parseReportId(req.params.id), req.body) })
  }

  router.post('/:id/accept', allow('librarian'), review('accepted'))
  router.post('/:id/reject', allow('librarian'), review('rejected'))
  router.post('/:id/adopt-modulus', allow('librarian'), adopt)
  async function curve(req: Request<{ id: string }>, res: Response) {
    res.json(await reportCurve(context, currentAuth(req).user, parseReportId(req.params.id)))
  }

  router.get('/:id/curve', allow('engineer'), curve)
  router.get('/:id/file', allow('engineer'), download('file'))
  router.get('/:id/photo', allow('engineer'), download('photo'))
  return router
}
