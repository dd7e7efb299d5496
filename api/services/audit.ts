/** The audit log: written inside the transaction of the change it records. */
import Papa from 'papaparse'
import { Op, type Transaction, type WhereOptions } from 'sequelize'
import { z } from 'zod'
import type { AppContext } from '../context'
import type { AuditEvent, User } from '../db'
import { validationFailed } from '../errors'
import { zodIssues } from '../validation'
import { isFormulaCell } from './csv-safety'

export interface AuditInput {
  actorId: number | null
  action: string
  subjectType: string
  subjectId: string | number
  details?: Record<string, unknown>
}

export interface AuditEventView {
  id: number
  at: string
  actor: { id: number; displayName: string } | null
  action: string
  subjectType: string
  subjectId: string
  details: Record<string, unknown>
}

export async function recordAudit(context: AppContext, transaction: Transaction, input: AuditInput): Promise<void> {
  await context.db.models.AuditEvent.create(
    { actorId: input.actorId, action: input.action, subjectType: input.subjectType, subjectId: String(input.subjectId), details: input.details ?? {}, at: new Date() },
    { transaction },
  )
}

function toAuditEventView(event: AuditEvent & { actor?: User | null }): AuditEventView {
  return {
    id: event.id,
    at: event.at.toISOString(),
    actor: event.actor ? { id: event.actor.id, displayName: event.actor.displayName } : null,
    action: event.action,
    subjectType: event.subjectType,
    subjectId: event.subjectId,
    details: event.details,
  }
}

const DAY = /^\d{4}-\d{2}-\d{2}$/
const dayField = (name: string) => z.string().refine((v) => DAY.test(v) && !Number.isNaN(Date.parse(`${v}T00:00:00Z`)), `${name} must be a date like 2026-03-31`)

/** The audit screen's filters, from the query string: person (as actor or subject), action, dates (UTC days, inclusive). */
const filterSchema = z.strictObject({
  person: z.string().regex(/^\d{1,15}$/, 'person must be a user id').transform(Number).optional(),
  action: z.string().max(64, 'action must be at most 64 characters').regex(/^[a-z0-9_.]*$/, 'action must be an action name like user.role_changed').optional(),
  from: dayField('from').optional(),
  to: dayField('to').optional(),
  limit: z.string().regex(/^\d{1,5}$/, 'limit must be a whole number').transform(Number).refine((n) => n >= 1 && n <= 5000, 'limit must be from 1 to 5000').optional(),
}, { error: (iss) => (iss.code === 'unrecognized_keys' ? `${iss.keys.join(', ')} is not a filter (person, action, from, to, limit)` : undefined) })

export type AuditFilter = z.infer<typeof filterSchema>

export function parseAuditFilter(query: unknown): AuditFilter {
  const result = filterSchema.safeParse(query ?? {})
  if (!result.success) throw validationFailed(zodIssues(result.error))
  if (result.data.from && result.data.to && result.data.from > result.data.to) throw validationFailed([{ field: 'to', message: 'to must not be before from' }])
  return result.data
}

/** Newest first, at most `limit` (500 by default) of the events the filter lets through. */
export async function listAuditEvents(context: AppContext, filter: AuditFilter = {}): Promise<AuditEventView[]> {
  const { AuditEvent, User } = context.db.models
  const where: WhereOptions[] = []
  if (filter.person !== undefined) where.push({ [Op.or]: [{ actorId: filter.person }, { subjectType: 'user', subjectId: String(filter.person) }] })
  if (filter.action) where.push({ action: filter.action })
  if (filter.from) where.push({ at: { [Op.gte]: new Date(`${filter.from}T00:00:00Z`) } })
  if (filter.to) where.push({ at: { [Op.lt]: new Date(Date.parse(`${filter.to}T00:00:00Z`) + 24 * 3600 * 1000) } })
  const events = await AuditEvent.findAll({
    where: where.length ? { [Op.and]: where } : undefined,
    include: [{ model: User, as: 'actor', attributes: ['id', 'displayName'] }],
    order: [['at', 'DESC'], ['id', 'DESC']],
    limit: filter.limit ?? 500,
  })
  return events.map(toAuditEventView)
}

/** Every action name in the log, for the screen's filter. */
export async function auditActions(context: AppContext): Promise<string[]> {
  const rows = await context.db.models.AuditEvent.findAll({ attributes: ['action'], group: ['action'], order: [['action', 'ASC']] })
  return rows.map((r) => r.action)
}

/** The filtered events as CSV; a cell a spreadsheet would run as a formula gets a leading apostrophe. */
export function auditCsv(events: AuditEventView[]): string {
  const safe = (v: string) => (isFormulaCell(v) ? `'${v}` : v)
  const rows = events.map((e) => [e.at, e.actor ? e.actor.displayName : e.details.via === 'command line' ? 'command line' : '', e.actor ? String(e.actor.id) : '', e.action, e.subjectType, e.subjectId, JSON.stringify(e.details)].map(safe))
  return Papa.unparse({ fields: ['at', 'actor', 'actor id', 'action', 'subject type', 'subject id', 'details'], data: rows }, { newline: '\r\n' })
}
