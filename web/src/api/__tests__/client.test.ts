import { afterEach, describe, expect, it, vi } from 'vitest'
import { ApiError, parseErrorBody, request, setAuthToken, setUnauthenticatedHandler } from '../client'

function reply(status: number, body: unknown, raw = false) {
  return vi.fn(async () => new Response(raw ? (body as string) : JSON.stringify(body), { status, headers: { 'Content-Type': raw ? 'text/html' : 'application/json' } }))
}

afterEach(() => {
  vi.unstubAllGlobals()
  setAuthToken(null)
  setUnauthenticatedHandler(null)
})

describe('parseErrorBody', () => {
  it('reads code, message and field issues from a validation_failed body (docs/api.md)', () => {
    const body = { error: { code: 'validation_failed', message: 'Some parameters are not valid', details: { issues: [{ field: 'span', message: 'Span must be at least 10 mm' }, { field: 'span', message: 'second' }, { field: 'thickness', message: 'Thickness must be a number' }] } } }
    const observed = parseErrorBody(400, JSON.stringify(body))
    expect(observed).toBeInstanceOf(ApiError)
    expect(observed.status).toBe(400)
    expect(observed.code).toBe('validation_failed')
    expect(observed.message).toBe('Some parameters are not valid')
    expect(observed.issues).toEqual([
      { field: 'span', message: 'Span must be at least 10 mm' },
      { field: 'span', message: 'second' },
      { field: 'thickness', message: 'Thickness must be a number' },
    ])
    expect(observed.fieldMessage('span')).toBe('Span must be at least 10 mm second')
    expect(observed.fieldMessage('depth')).toBe('')
  })

  it('drops malformed issues instead of failing', () => {
    const observed = parseErrorBody(400, JSON.stringify({ error: { code: 'validation_failed', message: 'bad', details: { issues: [{ field: 3 }, null, { field: 'depth', message: 'Depth is needed' }] } } }))
    expect(observed.issues).toEqual([{ field: 'depth', message: 'Depth is needed' }])
  })

  it('gives a 502 HTML page the internal code and a readable message', () => {
    const observed = parseErrorBody(502, '<html><body>Bad gateway</body></html>')
    expect(observed.code).toBe('internal')
    expect(observed.message).toMatch(/502/)
    expect(observed.issues).toEqual([])
  })

  it('falls back to a message per status when the body has none', () => {
    const observed = parseErrorBody(429, JSON.stringify({ error: { code: 'rate_limited' } }))
    expect(observed.code).toBe('rate_limited')
    expect(observed.message).toMatch(/Too many attempts/)
  })

  it('keeps details that are objects and ignores arrays', () => {
    expect(parseErrorBody(422, JSON.stringify({ error: { code: 'solver_failed', message: 'no path', details: { step: 12 } } })).details).toEqual({ step: 12 })
    expect(parseErrorBody(422, JSON.stringify({ error: { code: 'solver_failed', message: 'no path', details: [1] } })).details).toBeNull()
  })
})

describe('request', () => {
  it('sends JSON with the bearer token and parses the answer', async () => {
    const fetchMock = reply(200, { user: { id: 1 } })
    vi.stubGlobal('fetch', fetchMock)
    setAuthToken('tok-123')
    const observed = await request<{ user: { id: number } }>('POST', '/api/x', { body: { a: 1 } })
    expect(observed).toEqual({ user: { id: 1 } })
    const [path, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit]
    expect(path).toBe('/api/x')
    const headers = init.headers as Record<string, string>
    expect(headers.Authorization).toBe('Bearer tok-123')
    expect(headers['Content-Type']).toBe('application/json')
    expect(init.body).toBe('{"a":1}')
  })

  it('sends no Authorization header when signed out', async () => {
    const fetchMock = reply(200, { ok: true })
    vi.stubGlobal('fetch', fetchMock)
    await request('GET', '/api/health')
    const init = (fetchMock.mock.calls[0] as unknown as [string, RequestInit])[1]
    expect((init.headers as Record<string, string>).Authorization).toBeUndefined()
  })

  it('answers undefined for 204', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(null, { status: 204 })))
    expect(await request('POST', '/api/auth/signout')).toBeUndefined()
  })

  it('throws the parsed ApiError for an error status', async () => {
    vi.stubGlobal('fetch', reply(409, { error: { code: 'conflict', message: 'E-mail already registered', details: null } }))
    await expect(request('POST', '/api/auth/signup', { body: {} })).rejects.toMatchObject({ status: 409, code: 'conflict', message: 'E-mail already registered' })
  })

  it('turns a failed connection into a network ApiError', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('Failed to fetch') }))
    await expect(request('GET', '/api/entries')).rejects.toMatchObject({ status: 0, code: 'network' })
  })

  it('lets an abort through unchanged so stale requests can be ignored', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new DOMException('aborted', 'AbortError') }))
    await expect(request('GET', '/api/entries')).rejects.toMatchObject({ name: 'AbortError' })
  })

  it('calls the unauthenticated handler when a signed-in request gets 401', async () => {
    const handler = vi.fn()
    setUnauthenticatedHandler(handler)
    setAuthToken('expired')
    vi.stubGlobal('fetch', reply(401, { error: { code: 'unauthenticated', message: 'Sign in again', details: null } }))
    await expect(request('GET', '/api/entries')).rejects.toMatchObject({ code: 'unauthenticated' })
    expect(handler).toHaveBeenCalledTimes(1)
  })

  it('does not call the handler for a wrong password (no token sent)', async () => {
    const handler = vi.fn()
    setUnauthenticatedHandler(handler)
    vi.stubGlobal('fetch', reply(401, { error: { code: 'unauthenticated', message: 'Wrong e-mail or password', details: null } }))
    await expect(request('POST', '/api/auth/signin', { body: {} })).rejects.toBeInstanceOf(ApiError)
    expect(handler).not.toHaveBeenCalled()
  })

  it('reports a success answer that is not JSON', async () => {
    vi.stubGlobal('fetch', reply(200, '<html></html>', true))
    await expect(request('GET', '/api/entries')).rejects.toMatchObject({ code: 'bad_response' })
  })
})
