/**
 * Password reset by e-mail. Asking always answers the same (202, whether or not the address
 * has an account, and before any work is done), so the answer does not tell who has an
 * account. A known address with a password gets a link with a random token (256 bits);
 * only its SHA-256 hash is stored, it works once and for 30 minutes, and a newer link
 * replaces older ones (OWASP Forgot Password Cheat Sheet). Using it sets the new password,
 * ends every session of the account and clears a one-time password.
 */
import { createHash, randomBytes } from 'node:crypto'
import { Op } from 'sequelize'
import { z } from 'zod'
import type { AppContext } from '../context'
import type { User } from '../db'
import { HttpError } from '../errors'
import { bodySchema, parseBody } from '../validation'
import { recordAudit } from './audit'
import { emailField, hashPassword } from './auth'
import { notify } from './notifications'
import { passwordChangedNotice } from './password-change'
import { assertStrongPassword, newPasswordField } from './password-policy'
import { assertPasswordSignin } from './signup-policy'

const RESET_TOKEN_LIFETIME_MS = 30 * 60 * 1000
/** A second e-mail within this time is not sent (the first is still on its way). */
const RESEND_AFTER_MS = 60 * 1000

const requestBody = bodySchema({ email: emailField })
const confirmBody = bodySchema({
  token: z.string({ error: (iss) => (iss.input === undefined ? 'token is required' : 'token must be text') }).min(1, 'token is required').max(200, 'token is not a reset token'),
  newPassword: newPasswordField('newPassword'),
})

const hashResetToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex')

/** Checks the body and returns the work to do; the route answers 202 before running it. */
export function parseResetRequest(context: AppContext, body: unknown): () => Promise<void> {
  assertPasswordSignin(context)
  const { email } = parseBody(requestBody, body)
  return () => sendResetLink(context, email)
}

async function sendResetLink(context: AppContext, email: string): Promise<void> {
  const { User, PasswordResetToken } = context.db.models
  const user = await User.findOne({ where: { email } })
  if (!user || !user.passwordHash) return
  const token = randomBytes(32).toString('base64url')
  const now = Date.now()
  const created = await context.db.write(async (transaction) => {
    const recent = await PasswordResetToken.findOne({ where: { userId: user.id, usedAt: null, createdAt: { [Op.gt]: new Date(now - RESEND_AFTER_MS) } }, transaction })
    if (recent) return false
    await PasswordResetToken.destroy({ where: { userId: user.id }, transaction })
    await PasswordResetToken.create({ userId: user.id, tokenHash: hashResetToken(token), expiresAt: new Date(now + RESET_TOKEN_LIFETIME_MS), usedAt: null }, { transaction })
    await recordAudit(context, transaction, { actorId: null, action: 'user.password_reset_requested', subjectType: 'user', subjectId: user.id, details: { email: user.email } })
    return true
  })
  if (!created) return
  const link = `${context.config.publicUrl}/reset-password?token=${token}`
  await notify(context, [{
    to: [user.email],
    subject: 'Flexshelf: reset your password',
    text: `Hello ${user.displayName},\n\nsomeone asked to reset the password of your Flexshelf account. To choose a new one, open this link within 30 minutes:\n\n${link}\n\nThe link works once. If you did not ask for it, ignore this e-mail; your password stays as it is.`,
  }])
}

const invalidLink = () => new HttpError(400, 'reset_token_invalid', 'this reset link is not valid any more (used, expired or replaced by a newer one); ask for a new link', { field: 'token' })

export async function confirmReset(context: AppContext, body: unknown): Promise<void> {
  assertPasswordSignin(context)
  const input = parseBody(confirmBody, body)
  const { User, PasswordResetToken } = context.db.models
  const tokenHash = hashResetToken(input.token)
  const row = await PasswordResetToken.findOne({ where: { tokenHash, usedAt: null, expiresAt: { [Op.gt]: new Date() } } })
  const owner = row ? await User.findByPk(row.userId) : null
  if (!row || !owner) throw invalidLink()
  await assertStrongPassword(input.newPassword, [owner.email, owner.displayName], 'newPassword')
  const passwordHash = await hashPassword(context, input.newPassword)
  const user = await context.db.write(async (transaction) => {
    // single use even when two requests race: only one can mark the row
    const [marked] = await PasswordResetToken.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null, expiresAt: { [Op.gt]: new Date() } }, transaction })
    if (marked !== 1) throw invalidLink()
    const target = await User.findByPk(row.userId, { transaction }) as User
    await target.update({ passwordHash, tokenVersion: target.tokenVersion + 1, carriedSessionJti: null, passwordMustChange: false }, { transaction })
    await PasswordResetToken.destroy({ where: { userId: target.id, id: { [Op.ne]: row.id } }, transaction })
    await recordAudit(context, transaction, { actorId: target.id, action: 'user.password_reset', subjectType: 'user', subjectId: target.id, details: { email: target.email, via: 'e-mail link' } })
    return target
  })
  await notify(context, [passwordChangedNotice(user, 'reset with a link sent by e-mail')])
}
