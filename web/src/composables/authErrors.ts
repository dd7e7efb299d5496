/** What a failed sign-in or sign-up means to the person at the keyboard. */
import { ApiError } from '@/api'

export interface AuthFailure {
  /** Shown above the form. */
  message: string | null
  /** Shown under a field, keyed by field name (email, password, displayName). */
  fields: Record<string, string>
}

export function describeAuthFailure(error: unknown, mode: 'signin' | 'signup'): AuthFailure {
  if (!(error instanceof ApiError)) return { message: 'Something went wrong; please try again.', fields: {} }
  const fields: Record<string, string> = {}
  for (const issue of error.issues) fields[issue.field] = fields[issue.field] ? `${fields[issue.field]} ${issue.message}` : issue.message
  switch (error.code) {
    case 'unauthenticated':
      // deliberately vague: never reveal whether the e-mail has an account
      return { message: 'That e-mail and password do not match an account.', fields: {} }
    case 'rate_limited': {
      const wait = Number(error.details?.retryAfterSeconds ?? error.details?.retryAfter)
      const when = Number.isFinite(wait) && wait > 0 ? `in about ${Math.ceil(wait / 60)} minute${Math.ceil(wait / 60) === 1 ? '' : 's'}` : 'in a few minutes'
      return { message: `Too many sign-in attempts from this address. To protect accounts, sign-in is paused; try again ${when}.`, fields: {} }
    }
    case 'account_locked': {
      const wait = Number(error.details?.retryAfterSeconds)
      const minutes = Number.isFinite(wait) && wait > 0 ? Math.ceil(wait / 60) : 15
      return { message: `This account is locked after several wrong passwords. Try again in about ${minutes} minute${minutes === 1 ? '' : 's'}, or ask an admin.`, fields: {} }
    }
    case 'conflict':
      return { message: null, fields: { email: mode === 'signup' ? 'An account with this e-mail already exists; sign in instead.' : error.message } }
    case 'validation_failed':
      return { message: Object.keys(fields).length ? null : error.message, fields }
    default:
      return { message: error.message, fields }
  }
}
