/**
 * Single sign-on with OpenID Connect (openid-client): the authorization code flow with PKCE
 * (S256), state and nonce (OpenID Connect Core 1.0; RFC 7636). The verifier, state and nonce
 * ride in a short-lived signed HttpOnly cookie rather than server memory, so any instance can
 * finish a flow another one started. The callback creates or links the account by the
 * provider's subject, or by a *verified* e-mail, maps the role from a claim when
 * FLEXSHELF_OIDC_ROLES is set (the identity provider is then the source of roles), and
 * issues the same session token a password sign-in would.
 */
import * as client from 'openid-client'
import jwt from 'jsonwebtoken'
import type { AppContext } from '../context'
import type { OidcSettings } from '../config'
import type { User } from '../db'
import { HttpError } from '../errors'
import { roleRank, type Role } from '../roles'
import { recordAudit } from './audit'
import { issueToken } from './auth'
import { countSigninFailure } from './metrics'

/** How long a started sign-in may take at the identity provider. */
export const FLOW_TTL_SECONDS = 600

const configurations = new WeakMap<OidcSettings, Promise<client.Configuration>>()

/** The provider's metadata, discovered once (and again after a failure). */
function providerConfiguration(settings: OidcSettings): Promise<client.Configuration> {
  let found = configurations.get(settings)
  if (!found) {
    const insecure = new URL(settings.issuer).protocol === 'http:'
    found = client.discovery(new URL(settings.issuer), settings.clientId, undefined, client.ClientSecretBasic(settings.clientSecret), {
      // plain http only for a provider on this machine or outside production (config.ts checks which)
      execute: insecure ? [client.allowInsecureRequests] : [],
      timeout: 10,
    })
    found.catch(() => configurations.delete(settings))
    configurations.set(settings, found)
  }
  return found
}

export function requireOidc(context: AppContext): OidcSettings {
  if (!context.config.oidc) throw new HttpError(404, 'not_found', 'single sign-on is not set up here (FLEXSHELF_OIDC_ISSUER)')
  return context.config.oidc
}

interface FlowState {
  verifier: string
  state: string
  nonce: string
  /** Where the app goes after signing in (a same-site path). */
  next: string
}

function safeNext(value: unknown): string {
  if (typeof value !== 'string' || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\') || value.length > 500) return '/'
  return value
}

/** Starts a sign-in: the URL to send the browser to, and the sealed flow state for the cookie. */
export async function startSignin(context: AppContext, next: unknown): Promise<{ url: string; flowCookie: string }> {
  const settings = requireOidc(context)
  const configuration = await providerConfiguration(settings)
  const flow: FlowState = { verifier: client.randomPKCECodeVerifier(), state: client.randomState(), nonce: client.randomNonce(), next: safeNext(next) }
  const scope = ['openid', 'email', 'profile', ...(Object.keys(settings.roles).length ? [settings.roleClaim] : [])].join(' ')
  const url = client.buildAuthorizationUrl(configuration, {
    redirect_uri: settings.redirectUrl,
    scope,
    code_challenge: await client.calculatePKCECodeChallenge(flow.verifier),
    code_challenge_method: 'S256',
    state: flow.state,
    nonce: flow.nonce,
  })
  const flowCookie = jwt.sign(flow, context.config.jwtSecret, { algorithm: 'HS256', expiresIn: FLOW_TTL_SECONDS, audience: 'flexshelf-oidc-flow' })
  return { url: url.href, flowCookie }
}

export class SsoError extends Error {
  constructor(readonly code: 'flow_expired' | 'provider_refused' | 'email_unverified' | 'failed', message: string) {
    super(message)
    this.name = 'SsoError'
  }
}

function readFlow(context: AppContext, cookie: string | undefined): FlowState {
  if (!cookie) throw new SsoError('flow_expired', 'no sign-in was started from this browser, or it took longer than 10 minutes')
  try {
    return jwt.verify(cookie, context.config.jwtSecret, { algorithms: ['HS256'], audience: 'flexshelf-oidc-flow' }) as unknown as FlowState
  } catch {
    throw new SsoError('flow_expired', 'the sign-in took longer than 10 minutes, or its cookie was changed')
  }
}

/** The highest role any of the person's groups maps to; null when no mapping is configured. */
function mapRole(settings: OidcSettings, claims: Record<string, unknown>): Role | null {
  if (!Object.keys(settings.roles).length) return null
  const raw = claims[settings.roleClaim]
  const groups = Array.isArray(raw) ? raw.map(String) : typeof raw === 'string' ? raw.split(/[\s,]+/) : []
  let best: Role = 'engineer'
  for (const g of groups) {
    const role = settings.roles[g]
    if (role && roleRank(role) > roleRank(best)) best = role
  }
  return best
}

/** Finishes a sign-in from the provider's redirect: the session token, and where to go next. */
export async function finishSignin(context: AppContext, query: URLSearchParams, flowCookie: string | undefined): Promise<{ token: string; next: string }> {
  const settings = requireOidc(context)
  const flow = readFlow(context, flowCookie)
  if (query.get('error')) throw new SsoError('provider_refused', `the identity provider answered ${query.get('error')}`)
  const configuration = await providerConfiguration(settings)
  const current = new URL(settings.redirectUrl)
  current.search = query.toString()
  let tokens: Awaited<ReturnType<typeof client.authorizationCodeGrant>>
  try {
    tokens = await client.authorizationCodeGrant(configuration, current, {
      pkceCodeVerifier: flow.verifier, expectedState: flow.state, expectedNonce: flow.nonce, idTokenExpected: true,
    })
  } catch (err) {
    throw new SsoError('failed', `the sign-in could not be completed: ${(err as Error).message}`)
  }
  const idClaims = tokens.claims()!
  const info = await client.fetchUserInfo(configuration, tokens.access_token, idClaims.sub)
  const claims: Record<string, unknown> = { ...idClaims, ...info }
  const email = typeof claims.email === 'string' ? claims.email.trim().toLowerCase() : ''
  if (!email || claims.email_verified !== true) throw new SsoError('email_unverified', 'the identity provider did not confirm an e-mail address for this account')
  const name = (typeof claims.name === 'string' && claims.name.trim() ? claims.name.trim() : email.split('@')[0]).slice(0, 80)
  const user = await linkAccount(context, settings, { subject: idClaims.sub, email, name, role: mapRole(settings, claims) })
  return { token: issueToken(context, user), next: flow.next }
}

async function linkAccount(context: AppContext, settings: OidcSettings, who: { subject: string; email: string; name: string; role: Role | null }): Promise<User> {
  const { User } = context.db.models
  return context.db.write(async (transaction) => {
    const via = { via: 'single sign-on', issuer: settings.issuer }
    let user = await User.findOne({ where: { oidcIssuer: settings.issuer, oidcSubject: who.subject }, transaction })
    if (!user) {
      user = await User.findOne({ where: { email: who.email }, transaction })
      if (user) {
        await user.update({ oidcIssuer: settings.issuer, oidcSubject: who.subject }, { transaction })
        await recordAudit(context, transaction, { actorId: user.id, action: 'user.sso_linked', subjectType: 'user', subjectId: user.id, details: { email: user.email, ...via } })
      } else {
        user = await User.create({ email: who.email, displayName: who.name, role: who.role ?? 'engineer', passwordHash: '', oidcIssuer: settings.issuer, oidcSubject: who.subject }, { transaction })
        await recordAudit(context, transaction, { actorId: user.id, action: 'user.sso_created', subjectType: 'user', subjectId: user.id, details: { email: user.email, role: user.role, ...via } })
        return user
      }
    }
    if (who.role && who.role !== user.role) {
      const from = user.role
      // like a change made by an admin: the person's other sessions end
      await user.update({ role: who.role, tokenVersion: user.tokenVersion + 1, carriedSessionJti: null }, { transaction })
      await recordAudit(context, transaction, { actorId: null, action: 'user.role_changed', subjectType: 'user', subjectId: user.id, details: { email: user.email, from, to: who.role, ...via } })
    }
    return user
  })
}

export function countSsoFailure(): void {
  countSigninFailure('sso')
}

