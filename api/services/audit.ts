/** The audit log: written inside the transaction of the change it records. */
import type { Transaction } from 'sequelize'
import type { AppContext } from '../context'
import type { AuditEvent, User } from '../db'

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

/** Newest first; the admin screen shows the latest few hundred. */
export async function listAuditEvents(context: AppContext, limit = 500): Promise<AuditEventView[]> {
  const { AuditEvent, User } = context.db.models
  const events = await AuditEvent.findAll({
    include: [{ model: User, as: 'actor', attributes: ['id', 'displayName'] }],
    order: [['at', 'DESC'], ['id', 'DESC']],
    limit,
  })
  return events.map(toAuditEventView)
}
