/** The one error handler: every failure becomes { error: { code, message, details } }. */
import type { NextFunction, Request, Response } from 'express'
import { UniqueConstraintError } from 'sequelize'
import { SolverError, UnknownFamilyError, ValidationError } from '../../catalog'
import { HttpError } from '../errors'

interface BodyParserError extends Error {
  type?: string
  status?: number
  limit?: number
  /** zlib's code of a broken compressed body (Z_DATA_ERROR, ERR_BROTLI_…, ERR__ERROR_FORMAT_…). */
  code?: string
  expose?: boolean
}

export function toHttpError(err: unknown): HttpError {
  if (err instanceof HttpError) return err
  if (err instanceof ValidationError) {
    return new HttpError(400, 'validation_failed', err.message, { issues: err.issues })
  }
  if (err instanceof SolverError) {
    return new HttpError(422, 'solver_failed', `the solver could not follow the path: ${err.message}`, err.details)
  }
  if (err instanceof UnknownFamilyError) {
    return new HttpError(404, 'not_found', err.message, { familyId: err.familyId })
  }
  if (err instanceof UniqueConstraintError) {
    const fields = err.errors.map((e) => e.path).filter((p): p is string => Boolean(p))
    return new HttpError(409, 'conflict', `a record with this ${fields.join(', ') || 'value'} already exists`, { fields })
  }
  const parserError = err as BodyParserError
  if (parserError?.type === 'entity.parse.failed') {
    return new HttpError(400, 'malformed_json', 'the request body is not valid JSON', null)
  }
  if (parserError?.type === 'entity.too.large') {
    return new HttpError(413, 'payload_too_large', `the request body is larger than the limit of ${parserError.limit} bytes`, { limit: parserError.limit ?? null })
  }
  if (parserError?.type === 'encoding.unsupported' || parserError?.type === 'charset.unsupported') {
    return new HttpError(415, 'unsupported_media_type', parserError.message, null)
  }
  // a body that claims gzip, deflate or brotli but does not decompress: the client's fault
  if (parserError?.status === 400 && parserError.expose && typeof parserError.code === 'string') {
    return new HttpError(400, 'malformed_body', `the request body could not be decompressed as its Content-Encoding says (${parserError.message})`, null)
  }
  return new HttpError(500, 'internal', 'something went wrong on the server; the error has been logged', null)
}

export function errorHandler(log: (err: unknown) => void = (err) => console.error(err)) {
  return function handleError(err: unknown, _req: Request, res: Response, next: NextFunction) {
    if (res.headersSent) return next(err)
    const httpError = toHttpError(err)
    if (httpError.status >= 500 && httpError.code !== 'busy') log(err)
    // 429 (rate limits, lockout delays), 423 and 503 busy say when to come back
    const retryAfter = httpError.details?.retryAfterSeconds
    if (typeof retryAfter === 'number' && Number.isFinite(retryAfter)) res.set('Retry-After', String(Math.max(1, Math.ceil(retryAfter))))
    res.status(httpError.status).json({ error: { code: httpError.code, message: httpError.message, details: httpError.details } })
  }
}
