/**
 * The wire contract (contract/api.ts): every JSON route has its answer's schema, and the check
 * every test app runs on every answer (helpers.ts) refuses a body outside it, naming the field.
 */
import type { Express } from 'express'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bodilessRoutes, checkResponse, ContractViolation, responseContract } from '../../contract'
import { toFamilyView } from '../../api/services/families'
import { evaluate, getFamily } from '../../catalog'
import { startTestApp, type TestApp } from './helpers'


interface Layer { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; rawPath?: unknown }

function registeredRoutes(app: Express): string[] {
  const found: string[] = []
  const join = (...parts: string[]) => parts.join('').replace(/\/{2,}/g, '/').replace(/(.)\/$/, '$1')
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) for (const m of Object.keys(layer.route.methods)) { if (m !== '_all') found.push(`${m.toUpperCase()} ${join(prefix, layer.route.path)}`) }
      else if (layer.handle?.stack) walk(layer.handle.stack, join(prefix, typeof layer.rawPath === 'string' ? layer.rawPath : ''))
    }
  }
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '')
  return found.filter((r) => r.split(' ')[1].startsWith('/api'))
}

let t: TestApp
beforeAll(async () => { t = await startTestApp({ seed: false }) })
afterAll(() => t.close())

describe('the wire contract', () => {
  it('has a schema for every JSON route the app registers, and none for a route it does not', () => {
    const routes = registeredRoutes(t.app)
    expect(routes.length).toBeGreaterThan(40)
    expect(routes.filter((r) => !(r in responseContract) && !(r in bodilessRoutes)), 'routes the contract does not name').toEqual([])
    expect(Object.keys(responseContract).filter((r) => r in bodilessRoutes), 'routes named both with and without a body').toEqual([])
    expect(Object.keys(responseContract).filter((r) => !routes.includes(r)), 'schemas for routes that do not exist').toEqual([])
    expect(Object.keys(bodilessRoutes).filter((r) => !routes.includes(r)), 'bodiless entries for routes that do not exist').toEqual([])
  })

  it('takes the family list the API builds', () => {
    const family = toFamilyView(getFamily('bistable-beam'))
    expect(() => checkResponse('GET /api/families/:id', 200, { family })).not.toThrow()
  })

  it('refuses a body that leaves the contract, naming the field', () => {
    const family = toFamilyView(getFamily('bistable-beam'))
    const wrong = { family: { ...family, kind: 'gearbox' } }
    expect(() => checkResponse('GET /api/families/:id', 200, wrong)).toThrow(ContractViolation)
    expect(() => checkResponse('GET /api/families/:id', 200, wrong)).toThrow(/family\.kind/)
    const { cautions: _dropped, ...withoutCautions } = family
    expect(() => checkResponse('GET /api/families/:id', 200, { family: withoutCautions })).toThrow(/family\.cautions/)
    expect(() => checkResponse('GET /api/auth/me', 200, { user: { id: 1, email: 'a@b.example', displayName: 'A', role: 'owner', createdAt: '2026-01-01T00:00:00Z' } })).toThrow(/user\.role/)
  })

  it('describes the catalog\u2019s results field by field', () => {
    const evaluation = evaluate('leaf-hinge', {})
    expect(() => checkResponse('POST /api/families/:id/evaluate', 200, evaluation)).not.toThrow()
    const { source: _source, ...withoutSource } = evaluation
    expect(() => checkResponse('POST /api/families/:id/evaluate', 200, withoutSource)).toThrow(/source/)
    expect(() => checkResponse('POST /api/families/:id/evaluate', 200, { ...evaluation, material: { ...evaluation.material, modulus: '1800' } })).toThrow(/material\.modulus/)
    expect(() => checkResponse('POST /api/families/:id/evaluate', 200, { ...evaluation, curve: { ...evaluation.curve, axes: undefined } })).toThrow(/curve\.axes/)
    const session = { token: 'a.b.c', user: { id: 1, email: 'a@b.example', displayName: 'A', role: 'engineer', createdAt: '2026-01-01T00:00:00Z' } }
    expect(() => checkResponse('POST /api/auth/oidc/session', 200, session)).not.toThrow()
    expect(() => checkResponse('POST /api/auth/oidc/session', 200, { user: session.user })).toThrow(/token/)
  })

  it('holds every failure to the one error body', () => {
    expect(() => checkResponse('GET /api/families/:id', 404, { error: { code: 'not_found', message: 'module family "x" not found', details: null } })).not.toThrow()
    expect(() => checkResponse('GET /api/families/:id', 404, { message: 'not found' })).toThrow(/error/)
  })

  it('refuses an answer from a route it has no schema for', () => {
    expect(() => checkResponse('GET /api/unheard-of', 200, {})).toThrow(/no schema for this route/)
  })
})
