/**
 * What the admin command line does to accounts (api/cli/admin.ts), kept apart from argument
 * parsing so tests call it in-process. Each change is written with its audit event in one
 * transaction, like the web actions; the actor is "the command line" (actorId null) and the
 * details name the operating-system user who ran it.
 */
import { randomBytes } from 'node:crypto'
import { userInfo } from 'node:os'
import { ForeignKeyConstraintError } from 'sequelize'
import { z } from 'zod'
import type { AppContext } from '../context'
import type { User } from '../db'
import { DEMO_USERS } from '../db/demo-shelf'
import { conflict, HttpError, notFound, validationFailed } from '../errors'
import { ROLES, type Role } from '../roles'
import { parseBody, bodySchema, textField } from '../validation'
import { recordAudit } from './audit'
import { emailField, hashPassword } from './auth'
import { assertStrongPassword, newPasswordField } from './password-policy'
import { unlockAccount, type CliUnlock } from './account-unlock'

/** Who ran the command, for the audit log. */
function operator(): string {
  try {
    return userInfo().username
  } catch {
    return 'unknown'
  }
}
const viaCli = () => ({ via: 'command line', by: operator() })

/** A one-time password: 120 random bits in base64url (20 characters), to be replaced at first sign-in. */
function generatePassword(): string {
  return randomBytes(15).toString('base64url')
}

/** A signing secret: 384 random bits in base64url (64 characters). */
export function generateSecret(): string {
  return randomBytes(48).toString('base64url')
}

export type PasswordSource = { kind: 'given'; password: string } | { kind: 'generated' }

const roleField = z.enum(ROLES, { error: `role must be one of ${ROLES.join(', ')}` })
const addInput = bodySchema({ email: emailField, displayName: textField('name', 80), role: roleField })

async function choosePassword(source: PasswordSource, words: string[]): Promise<{ password: string; mustChange: boolean }> {
  if (source.kind === 'generated') return { password: generatePassword(), mustChange: true }
  const parsed = newPasswordField('password').safeParse(source.password)
  if (!parsed.success) throw validationFailed(parsed.error.issues.map((i) => ({ field: 'password', message: i.message })))
  await assertStrongPassword(source.password, words)
  return { password: source.password, mustChange: false }
}

async function findByEmail(context: AppContext, rawEmail: string): Promise<User> {
  const { email } = parseBody(bodySchema({ email: emailField }), { email: rawEmail })
  const user = await context.db.models.User.findOne({ where: { email } })
  if (!user) throw notFound(`an account with the e-mail ${email}`)
  return user
}

export interface AddedUser {
  user: User
  /** The generated one-time password, when one was asked for. */
  oneTimePassword: string | null
}

export async function addUser(context: AppContext, input: { email: string; name: string; role: string }, source: PasswordSource): Promise<AddedUser> {
  const fields = parseBody(addInput, { email: input.email, displayName: input.name, role: input.role })
  const { password, mustChange } = await choosePassword(source, [fields.email, fields.displayName])
  const passwordHash = await hashPassword(context, password)
  const { User } = context.db.models
  const user = await context.db.write(async (transaction) => {
    if (await User.findOne({ where: { email: fields.email }, transaction })) throw conflict(`an account with the e-mail ${fields.email} already exists`, { field: 'email' })
    const created = await User.create({ ...fields, passwordHash, passwordMustChange: mustChange }, { transaction })
    await recordAudit(context, transaction, {
      actorId: null, action: 'user.created', subjectType: 'user', subjectId: created.id,
      details: { email: created.email, role: created.role, oneTimePassword: mustChange, ...viaCli() },
    })
    return created
  })
  return { user, oneTimePassword: mustChange ? password : null }
}

export async function listAccounts(context: AppContext): Promise<User[]> {
  return context.db.models.User.findAll({ order: [['id', 'ASC']] })
}

/** Any role, admin included (the web grants only up to librarian); the last admin cannot be demoted. */
export async function setRole(context: AppContext, email: string, rawRole: string): Promise<{ user: User; from: Role }> {
  const role = parseBody(bodySchema({ role: roleField }), { role: rawRole }).role
  const found = await findByEmail(context, email)
  const { User } = context.db.models
  return context.db.write(async (transaction) => {
    const user = (await User.findByPk(found.id, { transaction }))!
    const from = user.role
    if (from === role) return { user, from }
    if (from === 'admin' && (await User.count({ where: { role: 'admin' }, transaction })) === 1) {
      throw new HttpError(409, 'last_admin', `${user.email} is the only admin; make someone else admin first`)
    }
    await user.update({ role, tokenVersion: user.tokenVersion + 1, carriedSessionJti: null }, { transaction })
    await recordAudit(context, transaction, { actorId: null, action: 'user.role_changed', subjectType: 'user', subjectId: user.id, details: { email: user.email, from, to: role, ...viaCli() } })
    return { user, from }
  })
}

export async function unlockByEmail(context: AppContext, email: string): Promise<{ user: User } & CliUnlock> {
  const user = await findByEmail(context, email)
  return { user, ...(await unlockAccount(context, user)) }
}

export async function resetPassword(context: AppContext, email: string, source: PasswordSource): Promise<{ user: User; oneTimePassword: string | null }> {
  const found = await findByEmail(context, email)
  const { password, mustChange } = await choosePassword(source, [found.email, found.displayName])
  const passwordHash = await hashPassword(context, password)
  const { User, PasswordResetToken } = context.db.models
  const user = await context.db.write(async (transaction) => {
    const target = (await User.findByPk(found.id, { transaction }))!
    await target.update({ passwordHash, passwordMustChange: mustChange, tokenVersion: target.tokenVersion + 1, carriedSessionJti: null }, { transaction })
    await PasswordResetToken.destroy({ where: { userId: target.id }, transaction })
    await recordAudit(context, transaction, { actorId: null, action: 'user.password_reset', subjectType: 'user', subjectId: target.id, details: { email: target.email, oneTimePassword: mustChange, ...viaCli() } })
    return target
  })
  return { user, oneTimePassword: mustChange ? password : null }
}

const DEMO_DOMAIN = '@demo.flexshelf.test'
const isDemoEmail = (email: string) => email.endsWith(DEMO_DOMAIN) || DEMO_USERS.some((d) => d.email === email)

/** Demo accounts that can still sign in (they have the published demo password, or had it). */
export async function demoAccountsWithPassword(context: AppContext): Promise<User[]> {
  const users = await context.db.models.User.findAll({ order: [['id', 'ASC']] })
  return users.filter((u) => isDemoEmail(u.email) && u.passwordHash !== '')
}

export interface DemoRemoval {
  deleted: string[]
  /** Accounts other records point at (entries, reports, comments): kept without a password, signed out. */
  disabled: string[]
}

export async function removeDemoAccounts(context: AppContext): Promise<DemoRemoval> {
  const result: DemoRemoval = { deleted: [], disabled: [] }
  const { User } = context.db.models
  for (const demo of await demoAccountsWithPassword(context)) {
    try {
      await context.db.write(async (transaction) => {
        await recordAudit(context, transaction, { actorId: null, action: 'user.demo_removed', subjectType: 'user', subjectId: demo.id, details: { email: demo.email, ...viaCli() } })
        await User.destroy({ where: { id: demo.id }, transaction })
      })
      result.deleted.push(demo.email)
    } catch (err) {
      if (!(err instanceof ForeignKeyConstraintError)) throw err
      await context.db.write(async (transaction) => {
        const user = (await User.findByPk(demo.id, { transaction }))!
        await user.update({ passwordHash: '', passwordMustChange: false, tokenVersion: user.tokenVersion + 1, carriedSessionJti: null }, { transaction })
        await recordAudit(context, transaction, { actorId: null, action: 'user.demo_disabled', subjectType: 'user', subjectId: user.id, details: { email: user.email, ...viaCli() } })
      })
      result.disabled.push(demo.email)
    }
  }
  return result
}
