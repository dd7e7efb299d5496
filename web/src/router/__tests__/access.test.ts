import { describe, expect, it } from 'vitest'
import { decideAccess, hasRole, safeRedirect } from '../access'

describe('hasRole (engineer < contributor < librarian < admin, docs/api.md)', () => {
  it.each([
    ['engineer', 'engineer', true],
    ['engineer', 'contributor', false],
    ['contributor', 'engineer', true],
    ['librarian', 'contributor', true],
    ['librarian', 'admin', false],
    ['admin', 'librarian', true],
  ] as const)('%s opening a %s route → %s', (actual, required, expected) => {
    expect(hasRole(actual, required)).toBe(expected)
  })

  it('nobody signed in has no role', () => {
    expect(hasRole(null, 'engineer')).toBe(false)
  })
})

describe('decideAccess', () => {
  it('sends an anonymous visitor to sign in with the path to return to', () => {
    expect(decideAccess({ role: 'engineer' }, null, '/entries/3?x=1')).toEqual({ kind: 'sign-in', redirect: '/entries/3?x=1' })
  })

  it('treats a route without meta as signed-in only', () => {
    expect(decideAccess({}, null, '/')).toEqual({ kind: 'sign-in', redirect: '/' })
    expect(decideAccess({}, 'engineer', '/')).toEqual({ kind: 'allow' })
  })

  it('shows the forbidden page to a role that is too low', () => {
    expect(decideAccess({ role: 'admin' }, 'librarian', '/admin/users')).toEqual({ kind: 'forbidden', required: 'admin' })
  })

  it('lets an admin into an admin route', () => {
    expect(decideAccess({ role: 'admin' }, 'admin', '/admin/users')).toEqual({ kind: 'allow' })
  })

  it('opens public routes to everyone', () => {
    expect(decideAccess({ public: true }, null, '/forbidden')).toEqual({ kind: 'allow' })
  })

  it('sends a signed-in user away from the sign-in page', () => {
    expect(decideAccess({ public: true, guestOnly: true }, 'engineer', '/signin')).toEqual({ kind: 'home' })
    expect(decideAccess({ public: true, guestOnly: true }, null, '/signin')).toEqual({ kind: 'allow' })
  })
})

describe('safeRedirect', () => {
  it('follows same-site paths', () => {
    expect(safeRedirect('/entries/4')).toBe('/entries/4')
  })
  it.each(['https://elsewhere.test/', '//elsewhere.test', '/\\elsewhere.test', 'entries/4', '/signin?redirect=/', undefined, ['/a']])('refuses %s', (value) => {
    expect(safeRedirect(value)).toBe('/')
  })
})
