/**
 * Unlocking an account delayed by failed sign-ins, for the admin command line: the one place
 * the CLI reaches the sign-in guard (signin-guard.ts), so it follows wherever the guard keeps
 * its counts. With the default in-memory store the counts live in the running server's memory,
 * which another process cannot reach; the caller is told so and says what to do instead.
 */
import type { AppContext } from '../context'
import type { User } from '../db'
import { guardStores, unlockUser } from './signin-guard'

export interface CliUnlock {
  /** Addresses whose delays were cleared here. */
  cleared: number
  /** Whether the counts are shared between processes (so clearing them here reaches the server). */
  shared: boolean
}

export async function unlockAccount(context: AppContext, user: User): Promise<CliUnlock> {
  const { cleared } = await unlockUser(context, null, user.id, 'cli')
  return { cleared, shared: Boolean(guardStores(context).failures) }
}
