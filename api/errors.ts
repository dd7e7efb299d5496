/** An error that becomes an HTTP answer `{ error: { code, message, details } }` (docs/api.md). */
export class HttpError extends Error {
  readonly status: number
  readonly code: string
  readonly details: Record<string, unknown> | null

  constructor(status: number, code: string, message: string, details: Record<string, unknown> | null = null) {
    super(message)
    this.name = 'HttpError'
    this.status = status
    this.code = code
    this.details = details
  }
}

export interface FieldIssue {
  field: string
  message: string
}

export function validationFailed(issues: FieldIssue[]): HttpError {
  return new HttpError(400, 'validation_failed', issues.map((i) => i.message).join('; '), { issues })
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} not found`)
export const forbidden = (message = 'your role does not allow this') => new HttpError(403, 'forbidden', message)
export const unauthenticated = (message = 'sign in first') => new HttpError(401, 'unauthenticated', message)
export const conflict = (message: string, details: Record<string, unknown> | null = null) => new HttpError(409, 'conflict', message, details)
