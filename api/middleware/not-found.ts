import type { Request, Response } from 'express'
import { HttpError } from '../errors'

/** JSON 404 for any request no route answered; registered just before the error handler. */
export function notFound(req: Request, _res: Response): never {
  throw new HttpError(404, 'not_found', `no route for ${req.method} ${req.originalUrl.split('?')[0]}`)
}
