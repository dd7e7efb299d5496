/**
 * The one way the web app talks to the server: `request()` adds the bearer token and turns
 * every failure into an ApiError (`{ error: { code, message, details } }`, docs/api.md).
 */
export interface FieldIssue {
  field: string
  message: string
}

export type ApiErrorCode =
  | 'malformed_json' | 'validation_failed' | 'unauthenticated' | 'forbidden' | 'not_found'
  | 'conflict' | 'payload_too_large' | 'unsupported_media_type' | 'solver_failed' | 'rate_limited' | 'internal'
  | 'network' | 'bad_response'

export class ApiError extends Error {
  readonly status: number
  readonly code: ApiErrorCode | string
  readonly details: Record<string, unknown> | null
  /** One entry per bad field (from `details.issues` of a 400). */
  readonly issues: FieldIssue[]

  constructor(status: number, code: string, message: string, details: Record<string, unknown> | null = null) {
    super(message)
    this.name = 'ApiError'
    this.status = status
    this.code = code
    this.details = details
    this.issues = readIssues(details)
  }

  /** The messages for one field, joined; '' when the field is fine. */
  fieldMessage(field: string): string {
    return this.issues.filter((i) => i.field === field).map((i) => i.message).join(' ')
  }
}

/** Any failure as an ApiError, so a view has one shape of error to show. */
export function asApiError(e: unknown): ApiError {
  return e instanceof ApiError ? e : new ApiError(0, 'internal', e instanceof Error ? e.message : String(e))
}

function readIssues(details: Record<string, unknown> | null): FieldIssue[] {
  const raw = details?.issues
  if (!Array.isArray(raw)) return []
  return raw
    .filter((i): i is FieldIssue => !!i && typeof i === 'object' && typeof (i as FieldIssue).field === 'string' && typeof (i as FieldIssue).message === 'string')
    .map((i) => ({ field: i.field, message: i.message }))
}

const fallbackMessages: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'Please sign in again.',
  403: 'Your role does not allow this.',
  404: 'Not found.',
  413: 'The upload is too large.',
  429: 'Too many attempts; wait a minute and try again.',
}

/** Builds the ApiError for a failed response from its status and (possibly non-JSON) body text. */
export function parseErrorBody(status: number, text: string): ApiError {
  let body: unknown
  try {
    body = text ? JSON.parse(text) : null
  } catch {
    body = null
  }
  const err = (body as { error?: unknown } | null)?.error
  if (err && typeof err === 'object') {
    const e = err as { code?: unknown; message?: unknown; details?: unknown }
    const code = typeof e.code === 'string' ? e.code : status >= 500 ? 'internal' : 'bad_response'
    const message = typeof e.message === 'string' && e.message ? e.message : fallbackMessages[status] ?? `The server answered ${status}.`
    const details = e.details && typeof e.details === 'object' && !Array.isArray(e.details) ? (e.details as Record<string, unknown>) : null
    return new ApiError(status, code, message, details)
  }
  const code = status >= 500 ? 'internal' : 'bad_response'
  return new ApiError(status, code, fallbackMessages[status] ?? `The server answered ${status} without an explanation.`)
}

let authToken: string | null = null
let onUnauthenticated: (() => void) | null = null

export function setAuthToken(token: string | null): void {
  authToken = token
}

/** The Authorization header for requests made outside request() (event streams). */
export function authorizationHeaders(): Record<string, string> {
  return authToken ? { Authorization: `Bearer ${authToken}` } : {}
}

/** Called when a signed-in request comes back 401 (expired or revoked token). */
export function setUnauthenticatedHandler(handler: (() => void) | null): void {
  onUnauthenticated = handler
}

export interface RequestOptions {
  body?: unknown
  signal?: AbortSignal
}

export async function request<T>(method: string, path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' }
  // a FormData body (multipart upload) sets its own content type with the boundary
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData
  if (options.body !== undefined && !isForm) headers['Content-Type'] = 'application/json'
  const sentToken = authToken
  if (sentToken) headers.Authorization = `Bearer ${sentToken}`
  let response: Response
  try {
    response = await fetch(path, {
      method,
      headers,
      body: options.body === undefined ? undefined : isForm ? (options.body as FormData) : JSON.stringify(options.body),
      signal: options.signal,
    })
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.')
  }
  const text = await response.text()
  if (!response.ok) {
    const error = parseErrorBody(response.status, text)
    if (response.status === 401 && sentToken && onUnauthenticated) onUnauthenticated()
    throw error
  }
  if (response.status === 204 || !text) return undefined as T
  try {
    return JSON.parse(text) as T
  } catch {
    throw new ApiError(response.status, 'bad_response', 'The server sent an answer that is not JSON.')
  }
}

export function isAbort(error: unknown): boolean {
  return error instanceof DOMException && error.name === 'AbortError'
}

/** A signed-in GET for a file (a report's CSV or photo): the bytes as a Blob, failures as ApiError. */
export async function requestBlob(path: string, signal?: AbortSignal): Promise<Blob> {
  const headers: Record<string, string> = {}
  const sentToken = authToken
  if (sentToken) headers.Authorization = `Bearer ${sentToken}`
  let response: Response
  try {
    response = await fetch(path, { headers, signal })
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.')
  }
  if (!response.ok) {
    const error = parseErrorBody(response.status, await response.text())
    if (response.status === 401 && sentToken && onUnauthenticated) onUnauthenticated()
    throw error
  }
  return response.blob()
}
