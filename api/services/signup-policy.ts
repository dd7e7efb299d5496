/**
 * Who may create an account with a password: nobody (FLEXSHELF_SIGNUP=off; admins add
 * people with the admin command line, or single sign-on creates them), or anyone, optionally
 * only with an e-mail in the company's domains (FLEXSHELF_SIGNUP_DOMAINS).
 */
import type { AppContext } from '../context'
import { HttpError, validationFailed } from '../errors'

/** Password sign-in, sign-up and reset answer 403 when single sign-on is the only way in. */
export function assertPasswordSignin(context: AppContext): void {
  if (context.config.passwordSignin) return
  const name = context.config.oidc?.name ?? 'single sign-on'
  throw new HttpError(403, 'password_signin_off', `password sign-in is switched off here; sign in with ${name}`)
}

function emailDomain(email: string): string {
  return email.slice(email.lastIndexOf('@') + 1).toLowerCase()
}

export function assertSignupAllowed(context: AppContext, email: string): void {
  const { mode, domains } = context.config.signup
  if (mode === 'off') throw new HttpError(403, 'signup_closed', 'sign-up is switched off here; ask an admin for an account')
  if (domains.length && !domains.includes(emailDomain(email))) {
    const list = domains.map((d) => `@${d}`).join(', ')
    throw validationFailed([{ field: 'email', message: `sign-up is open only to e-mail addresses ending in ${list}` }])
  }
}
