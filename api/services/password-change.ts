/**
 * A signed-in user changes their own password. Every other session of theirs ends (the
 * token version moves on); the session that made the change carries on, so the person is
 * not thrown out of the screen they are using. The change is audited and the owner told by
 * e-mail, so a change they did not make does not go unnoticed.
 */
import { z } from 'zod'
import type { AppContext } from '../context'
import { HttpError, validationFailed } from '../errors'
import { bodySchema, parseBody } from '../validation'
import { recordAudit } from './audit'
import { hashPassword, passwordMatches, type Authenticated } from './auth'
import { notify, type Notice } from './notifications'
import { assertStrongPassword, newPasswordField } from './password-policy'
import { assertPasswordSignin } from './signup-policy'

const changeBody = bodySchema({
  currentPassword: z.string({ error: (iss) => (iss.input === undefined ? 'currentPassword is required' : 'currentPassword must be text') })
    .min(1, 'currentPassword is required').max(1024, 'currentPassword is too long'),
  newPassword: newPasswordField('newPassword'),
})

export function passwordChangedNotice(user: { email: string; displayName: string }, how: string): Notice {
  return {
    to: [user.email],
    subject: 'Flexshelf: your password was changed',
    text: `Hello ${user.displayName},\n\nyour Flexshelf password was ${how}. Your other sessions were signed out.\nIf this was not you, ask an admin to reset your password at once.`,
  }
}

export async function changePassword(context: AppContext, auth: Authenticated, body: unknown): Promise<void> {
  assertPasswordSignin(context)
  const input = parseBody(changeBody, body)
  const { User, PasswordResetToken } = context.db.models
  const user = await User.findByPk(auth.user.id)
  if (!user) throw new HttpError(401, 'unauthenticated', 'the account no longer exists')
  if (!user.passwordHash) throw new HttpError(409, 'no_password', 'this account signs in through single sign-on and has no password here')
  if (!(await passwordMatches(user, input.currentPassword))) {
    throw validationFailed([{ field: 'currentPassword', message: 'currentPassword is not your current password' }])
  }
  if (input.newPassword === input.currentPassword) throw validationFailed([{ field: 'newPassword', message: 'newPassword must differ from the current password' }])
  await assertStrongPassword(input.newPassword, [user.email, user.displayName], 'newPassword')
  const passwordHash = await hashPassword(context, input.newPassword)
  await context.db.write(async (transaction) => {
    const fresh = await User.findByPk(user.id, { transaction })
    if (!fresh) throw new HttpError(401, 'unauthenticated', 'the account no longer exists')
    await fresh.update({ passwordHash, tokenVersion: fresh.tokenVersion + 1, carriedSessionJti: auth.jti, passwordMustChange: false }, { transaction })
    // a reset link asked for before the change must not undo it
    await PasswordResetToken.destroy({ where: { userId: fresh.id }, transaction })
    await recordAudit(context, transaction, { actorId: fresh.id, action: 'user.password_changed', subjectType: 'user', subjectId: fresh.id, details: { email: fresh.email } })
  })
  await notify(context, [passwordChangedNotice(user, 'changed from a signed-in session')])
}
