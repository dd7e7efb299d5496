/**
 * Unlocking an account locked by failed sign-ins. The admin command line calls this one
 * function, so it follows wherever the lockout keeps its state.
 */
import type { AppContext } from '../context'
import type { User } from '../db'
import { recordAudit } from './audit'

export async function unlockAccount(context: AppContext, user: User, by: { actorId: number | null; details?: Record<string, unknown> }): Promise<void> {
  await context.db.write((transaction) => recordAudit(context, transaction, {
    actorId: by.actorId, action: 'user.unlocked', subjectType: 'user', subjectId: user.id, details: { email: user.email, ...by.details },
  }))
}
