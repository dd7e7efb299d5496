/** Listing users and changing roles (admins only; the routes enforce the role). */
import { z } from 'zod'
import type { AppContext } from '../context'
import type { User } from '../db'
import { forbidden, notFound } from '../errors'
import { ASSIGNABLE_ROLES, type Role } from '../roles'
import { bodySchema, parseBody } from '../validation'
import { recordAudit } from './audit'
import { notify, roleChangedNotice, type Notice } from './notifications'

export interface UserView {
  id: number
  email: string
  displayName: string
  role: Role
  createdAt: string
  /** Whether the account has a password here (false: single sign-on only). */
  hasPassword: boolean
  /** A one-time password is in use: the user must choose their own first. */
  mustChangePassword: boolean
  /** Linked to an identity provider account (single sign-on). */
  sso: boolean
}

export function toUserView(user: User): UserView {
  return {
    id: user.id, email: user.email, displayName: user.displayName, role: user.role, createdAt: user.createdAt.toISOString(),
    hasPassword: Boolean(user.passwordHash), mustChangePassword: Boolean(user.passwordMustChange), sso: Boolean(user.oidcSubject),
  }
}

const roleBody = bodySchema({
  role: z.enum(ASSIGNABLE_ROLES, { error: `role must be one of ${ASSIGNABLE_ROLES.join(', ')}` }),
})

export async function listUsers(context: AppContext): Promise<UserView[]> {
  const users = await context.db.models.User.findAll({ order: [['id', 'ASC']] })
  return users.map(toUserView)
}

export function parseUserId(raw: string): number {
  const id = Number(raw)
  if (!/^\d{1,15}$/.test(raw) || !Number.isSafeInteger(id)) throw notFound('user')
  return id
}

/**
 * Grants or revokes contributor and librarian. Admins cannot change their own role or
 * another admin's. A change bumps tokenVersion, so the user's open sessions end.
 */
export async function changeRole(context: AppContext, actor: User, userId: number, body: unknown): Promise<UserView> {
  const { role } = parseBody(roleBody, body)
  const { User } = context.db.models
  const notices: Notice[] = []
  const user = await context.db.write(async (transaction) => {
    const target = await User.findByPk(userId, { transaction })
    if (!target) throw notFound('user')
    if (target.id === actor.id) throw forbidden('you cannot change your own role')
    if (target.role === 'admin') throw forbidden("an admin's role cannot be changed here")
    if (target.role === role) return target
    const from = target.role
    await target.update({ role, tokenVersion: target.tokenVersion + 1, carriedSessionJti: null }, { transaction })
    await recordAudit(context, transaction, {
      actorId: actor.id, action: 'user.role_changed', subjectType: 'user', subjectId: target.id,
      details: { email: target.email, from, to: role },
    })
    notices.push(roleChangedNotice(target, from, role))
    return target
  })
  // after the commit: the e-mail tells of a change that has happened
  await notify(context, notices)
  return toUserView(user)
}
