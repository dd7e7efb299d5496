import { describe, expect, it } from 'vitest'
import { ApiError } from '@/api'
import { describeAuthFailure } from '../authErrors'

describe('describeAuthFailure', () => {
  it('gives a wrong password the same words whatever the server says', () => {
    const observed = describeAuthFailure(new ApiError(401, 'unauthenticated', 'No user with that e-mail'), 'signin')
    expect(observed).toEqual({ message: 'That e-mail and password do not match an account.', fields: {} })
  })
  it('explains the rate limit and when to come back', () => {
    expect(describeAuthFailure(new ApiError(429, 'rate_limited', 'slow down', { retryAfterSeconds: 90 }), 'signin').message).toMatch(/Too many sign-in attempts.*about 2 minutes/)
    expect(describeAuthFailure(new ApiError(429, 'rate_limited', 'slow down'), 'signin').message).toMatch(/in a few minutes/)
  })
  it('says a locked account is locked and for how long', () => {
    expect(describeAuthFailure(new ApiError(423, 'account_locked', 'locked', { retryAfterSeconds: 840 }), 'signin').message).toMatch(/account is locked.*about 14 minutes/)
  })
  it('puts a duplicate e-mail under the e-mail field', () => {
    expect(describeAuthFailure(new ApiError(409, 'conflict', 'exists'), 'signup')).toEqual({ message: null, fields: { email: 'An account with this e-mail already exists; sign in instead.' } })
  })
  it('puts the weak-password rule under the password field', () => {
    const error = new ApiError(400, 'validation_failed', 'invalid', { issues: [{ field: 'password', message: 'Password must be at least 10 characters' }] })
    expect(describeAuthFailure(error, 'signup')).toEqual({ message: null, fields: { password: 'Password must be at least 10 characters' } })
  })
  it('shows a generic message for anything that is not an ApiError', () => {
    expect(describeAuthFailure(new Error('x'), 'signin').message).toMatch(/try again/)
  })
})
