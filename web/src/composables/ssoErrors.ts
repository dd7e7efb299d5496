/** What a failed single sign-on (the `sso_error` the server redirects with) means to the person. */
export function describeSsoError(code: unknown, providerName: string): string | null {
  if (typeof code !== 'string' || !code) return null
  switch (code) {
    case 'flow_expired': return 'The sign-in took too long or was started in another browser. Please try again.'
    case 'provider_refused': return `${providerName} did not let you in. If you cancelled, try again; otherwise ask your IT team.`
    case 'email_unverified': return `${providerName} has not confirmed an e-mail address for your account, so Flexshelf cannot tell who you are. Ask your IT team.`
    default: return `Signing in with ${providerName} did not work. Please try again.`
  }
}
