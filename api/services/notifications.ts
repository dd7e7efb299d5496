/**
 * Notification e-mail through nodemailer. Every message is recorded in the outbox table with
 * whether the transport took it. Without FLEXSHELF_SMTP_URL the transport is nodemailer's
 * JSON transport (the message is built and addressed but goes nowhere), so development and
 * tests read what would have been sent from the outbox. A failed send is logged and marked
 * failed; it never undoes or blocks the change that caused it.
 */
import nodemailer, { type Transporter } from 'nodemailer'
import type { Config } from '../config'
import type { AppContext } from '../context'
import type { OutboxMessage, User } from '../db'
import type { Role } from '../roles'

export interface Notice {
  to: string[]
  subject: string
  text: string
}

export interface OutboxMessageView {
  id: number
  to: string[]
  subject: string
  text: string
  at: string
  transport: string
  status: string
  error: string | null
}

const transports = new WeakMap<Config, { kind: 'smtp' | 'outbox'; transporter: Transporter }>()

function transportFor(config: Config) {
  let entry = transports.get(config)
  if (!entry) {
    entry = config.mail.smtpUrl
      // short timeouts: a dead mail server must not hold a librarian's request for long
      ? { kind: 'smtp', transporter: nodemailer.createTransport(config.mail.smtpUrl, { connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10000 }) }
      : { kind: 'outbox', transporter: nodemailer.createTransport({ jsonTransport: true }) }
    transports.set(config, entry)
  }
  return entry
}

const FOOTER = '\n\n—\nFlexshelf, the compliant-module shelf. You receive this because of your role on the shelf.'

async function sendOne(context: AppContext, notice: Notice): Promise<void> {
  const { kind, transporter } = transportFor(context.config)
  let status: 'sent' | 'failed' = 'sent'
  let error: string | null = null
  try {
    await transporter.sendMail({ from: context.config.mail.from, to: notice.to, subject: notice.subject, text: notice.text + FOOTER })
  } catch (err) {
    status = 'failed'
    error = (err as Error).message || String(err)
    console.warn(`notification "${notice.subject}" to ${notice.to.join(', ')} failed: ${error}`)
  }
  try {
    await context.db.write((transaction) => context.db.models.OutboxMessage.create(
      { to: notice.to, subject: notice.subject, text: notice.text + FOOTER, transport: kind, status, error, at: new Date() },
      { transaction },
    ))
  } catch (err) {
    console.warn(`could not record notification "${notice.subject}" in the outbox: ${(err as Error).message}`)
  }
}

/** Sends each notice with at least one recipient; never throws. */
export async function notify(context: AppContext, notices: Notice[]): Promise<void> {
  for (const notice of notices) {
    if (notice.to.length === 0) continue
    await sendOne(context, notice)
  }
}

/** The curators: every librarian, or the admins when there is no librarian yet. */
export async function librarianAddresses(context: AppContext): Promise<string[]> {
  const { User } = context.db.models
  const librarians = await User.findAll({ where: { role: 'librarian' }, attributes: ['email'], order: [['id', 'ASC']] })
  const list = librarians.length ? librarians : await User.findAll({ where: { role: 'admin' }, attributes: ['email'], order: [['id', 'ASC']] })
  return list.map((u) => u.email)
}

const ROLE_SENTENCES: Record<Role, string> = {
  engineer: 'search the shelf, configure modules and download STL files and data sheets',
  contributor: 'also propose entries and upload measured curves from the test stand',
  librarian: 'also review proposals and test reports, release and retire entries',
  admin: 'also grant and revoke roles',
}

export function roleChangedNotice(user: User, from: Role, to: Role): Notice {
  return {
    to: [user.email],
    subject: `Flexshelf: your role is now ${to}`,
    text: `Hello ${user.displayName},\n\nan admin changed your Flexshelf role from ${from} to ${to}. You can now ${ROLE_SENTENCES[to]}.\nSign in again to continue; your open sessions were ended by the change.`,
  }
}

function toOutboxView(m: OutboxMessage): OutboxMessageView {
  return { id: m.id, to: m.to, subject: m.subject, text: m.text, at: m.at.toISOString(), transport: m.transport, status: m.status, error: m.error }
}

/** Newest first, at most `limit`. */
export async function listOutbox(context: AppContext, limit = 500): Promise<OutboxMessageView[]> {
  const messages = await context.db.models.OutboxMessage.findAll({ order: [['at', 'DESC'], ['id', 'DESC']], limit })
  return messages.map(toOutboxView)
}
