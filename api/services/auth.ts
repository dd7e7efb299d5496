/**
 * Sign-up, sign-in, sign-out and token checks. Tokens are HS256 JWTs carrying the user id,
 * the user's tokenVersion (bumped on a role or password change) and a jti (listed when
 * signed out).
 */
import { createSecretKey, randomUUID, type KeyObject } from 'node:crypto'
import jwt from 'jsonwebtoken'
import { Op } from 'sequelize'
import { z } from 'zod'
import type { AppContext } from '../context'
import type { User } from '../db'
import { HttpError, unauthenticated } from '../errors'
import { bodySchema, parseBody, textField } from '../validation'
import { recordAudit } from './audit'
import { compute } from './compute-pool'
import { countSigninFailure } from './metrics'
import { assertStrongPassword, newPasswordField, PASSWORD_MAX_BYTES } from './password-policy'
import { readCache } from './read-cache'
import { assertPasswordSignin, assertSignupAllowed } from './signup-policy'
import { toUserView, type UserView } from './users'

const JWT_ALGORITHM = 'HS256' as const
const WRONG_CREDENTIALS = 'e-mail or password is wrong'
/** How long a token's user lookup may be reused at most, ms. */
const SESSION_RECHECK_MS = 10_000

export const emailField = z
  .string({ error: (iss) => (iss.input === undefined ? 'email is required' : 'email must be text') })
  .trim()
  .toLowerCase()
  .max(254, 'email must be at most 254 characters')
  .email({ error: 'email must be an e-mail address' })

const signupBody = bodySchema({ email: emailField, password: newPasswordField('password'), displayName: textField('displayName', 80) })

const signinBody = bodySchema({
  email: emailField,
  password: z.string({ error: (iss) => (iss.input === undefined ? 'password is required' : 'password must be text') })
    .min(1, 'password is required').max(1024, 'password is too long'),
})

export interface Session {
  token: string
  user: UserView
}

export interface Authenticated {
  user: User
  jti: string
  expiresAt: Date
}

interface Claims {
  sub: string
  ver: number
  jti: string
  exp: number
}

export function hashPassword(context: AppContext, password: string): Promise<string> {
  return compute.hashPassword(password, context.config.bcryptCost)
}

export function issueToken(context: AppContext, user: User): string {
  return jwt.sign({ ver: user.tokenVersion }, context.config.jwtSecret, {
    algorithm: JWT_ALGORITHM,
    expiresIn: context.config.jwtExpiresIn as jwt.SignOptions['expiresIn'],
    subject: String(user.id),
    jwtid: randomUUID(),
  })
}

export async function signUp(context: AppContext, body: unknown): Promise<Session> {
  assertPasswordSignin(context)
  const input = parseBody(signupBody, body)
  assertSignupAllowed(context, input.email)
  await assertStrongPassword(input.password, [input.email, input.displayName])
  const passwordHash = await hashPassword(context, input.password)
  const { User } = context.db.models
  const user = await context.db.write(async (transaction) => {
    const existing = await User.findOne({ where: { email: input.email }, transaction })
    if (existing) throw new HttpError(409, 'conflict', 'an account with this e-mail already exists', { field: 'email' })
    // sign-up always makes an engineer; higher roles are granted by an admin
    const created = await User.create({ email: input.email, passwordHash, displayName: input.displayName, role: 'engineer' }, { transaction })
    await recordAudit(context, transaction, { actorId: created.id, action: 'user.signup', subjectType: 'user', subjectId: created.id, details: { email: created.email } })
    return created
  })
  return { token: issueToken(context, user), user: toUserView(user) }
}

// compared against when the e-mail is unknown, so both failures take the same time
let dummyHash: Promise<string> | undefined

export async function signIn(context: AppContext, body: unknown): Promise<Session> {
  assertPasswordSignin(context)
  const input = parseBody(signinBody, body)
  const user = await context.db.models.User.findOne({ where: { email: input.email } })
  // bcrypt compares only the first 72 bytes, so a longer guess could match a 72-byte
  // password it merely starts with; no stored password is longer, so refuse it outright.
  // An account without a password (single sign-on only) is refused the same way.
  const tooLong = Buffer.byteLength(input.password, 'utf8') > PASSWORD_MAX_BYTES
  if (!user || tooLong || !user.passwordHash) {
    dummyHash ??= compute.hashPassword('not-a-password-of-anyone', context.config.bcryptCost)
    await compute.comparePassword(input.password, await dummyHash)
    countSigninFailure('wrong_credentials')
    throw unauthenticated(WRONG_CREDENTIALS)
  }
  // bcrypt on the compute pool: a burst of sign-ins does not stall other requests
  if (!(await compute.comparePassword(input.password, user.passwordHash))) {
    countSigninFailure('wrong_credentials')
    throw unauthenticated(WRONG_CREDENTIALS)
  }
  return { token: issueToken(context, user), user: toUserView(user) }
}

/** Checks a password against the user's stored hash on the compute pool; false for an account without one. */
export async function passwordMatches(user: User, password: string): Promise<boolean> {
  if (!user.passwordHash || Buffer.byteLength(password, 'utf8') > PASSWORD_MAX_BYTES) return false
  return compute.comparePassword(password, user.passwordHash)
}

// jsonwebtoken turns a string secret into a key object on every call; once per config is enough
const secretKeys = new WeakMap<AppContext['config'], KeyObject>()
function secretKey(context: AppContext): KeyObject {
  let key = secretKeys.get(context.config)
  if (!key) secretKeys.set(context.config, (key = createSecretKey(Buffer.from(context.config.jwtSecret, 'utf8'))))
  return key
}

function verifyClaims(context: AppContext, token: string): Claims {
  try {
    const claims = jwt.verify(token, secretKey(context), { algorithms: [JWT_ALGORITHM] })
    if (typeof claims === 'string' || !claims.sub || !claims.jti || typeof claims.ver !== 'number' || typeof claims.exp !== 'number') {
      throw new Error('token is missing claims')
    }
    return { sub: claims.sub, ver: claims.ver, jti: claims.jti, exp: claims.exp }
  } catch (err) {
    if (err instanceof jwt.TokenExpiredError) throw unauthenticated('your session has expired; sign in again')
    throw unauthenticated('the sign-in token is not valid; sign in again')
  }
}

/** Checks a bearer token: signature, expiry, not signed out, user present, role unchanged. */
export async function authenticateToken(context: AppContext, token: string): Promise<Authenticated> {
  const claims = verifyClaims(context, token)
  const { User, RevokedToken } = context.db.models
  // the two lookups behind every request, kept until a user or a revocation is written
  // (read-cache.ts), so sign-out and role changes still take effect on the next request; the
  // key also changes every SESSION_RECHECK_MS, so a change made by the admin command line (another
  // process, whose writes the hooks cannot see) takes effect within that time
  const bucket = Math.floor(Date.now() / SESSION_RECHECK_MS)
  const found = await readCache(context.db).read('session', `${claims.jti}|${claims.sub}|${bucket}`, ['User', 'RevokedToken'], async () => ({
    revoked: Boolean(await RevokedToken.findByPk(claims.jti)),
    user: await User.findByPk(Number(claims.sub)),
  }))
  if (found.revoked) throw unauthenticated('this session has been signed out; sign in again')
  const { user } = found
  if (!user) throw unauthenticated('the account no longer exists')
  // the session that changed the password carries on (password-change.ts); a role change or a reset clears it
  const carried = user.carriedSessionJti !== null && claims.jti === user.carriedSessionJti
  if (user.tokenVersion !== claims.ver && !carried) throw unauthenticated('your role or password has changed; sign in again')
  return { user, jti: claims.jti, expiresAt: new Date(claims.exp * 1000) }
}

/** Revokes the token; its id is kept until it would have expired anyway. */
export async function signOut(context: AppContext, auth: Authenticated): Promise<void> {
  const { RevokedToken } = context.db.models
  await context.db.write(async (transaction) => {
    await RevokedToken.destroy({ where: { expiresAt: { [Op.lt]: new Date() } }, transaction })
    await RevokedToken.findOrCreate({ where: { jti: auth.jti }, defaults: { jti: auth.jti, expiresAt: auth.expiresAt }, transaction })
  })
}
