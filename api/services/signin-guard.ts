/**
 * What stands between a sign-in flood and the password hashes, designed so it cannot be
 * turned against an account's owner:
 *
 * - Rate limits per client address, whatever e-mail is typed (routes/auth.ts, express-rate-limit):
 *   failed sign-ins per address, and sign-ups per address. Made-up e-mails from one address are
 *   limited like real ones.
 * - Growing delays per account *and* address (this file): after `freeFailures` wrong passwords
 *   for one account from one address, that address must wait before its next attempt for that
 *   account: baseDelayMs, then twice that after each further failure, at most maxDelayMs. The
 *   attempt is refused (429, Retry-After) before any password is checked. Failures from one
 *   address never delay the right password from another, so guessing cannot lock the owner out;
 *   a success clears the pair. Unknown e-mails are counted the same way, so answers do not tell
 *   which accounts exist.
 * - Admins clear an account's delays with POST /api/users/:id/unlock (unlockUser, audited).
 *
 * The counts live behind SigninFailureStore; the default keeps them in memory (bounded, like
 * the rate limits' store), and installGuardStores plugs in a shared one (Redis) for several
 * server processes.
 */
import { LRUCache } from 'lru-cache'
import type { Store } from 'express-rate-limit'
import type { AppContext } from '../context'
import type { User } from '../db'
import { HttpError, notFound } from '../errors'
import { recordAudit } from './audit'
import { toUserView, type UserView } from './users'

export interface LockoutSettings {
  /** Wrong passwords for one account from one address before the delays start. */
  failures: number
  /** The first delay, ms; each further failure doubles it. */
  baseDelayMs: number
  /** The longest delay, ms (FLEXSHELF_LOCKOUT_MS). */
  lockMs: number
}

export interface FailureRecord {
  failures: number
  lastFailureAt: number
}

/** Where failures per account and address are kept; every method may be asynchronous (Redis). */
export interface SigninFailureStore {
  get(account: string, address: string): Promise<FailureRecord | null> | FailureRecord | null
  /** Counts one more failure at `now`; a record last touched more than `ttlMs` ago starts over. */
  increment(account: string, address: string, now: number, ttlMs: number): Promise<FailureRecord> | FailureRecord
  clear(account: string, address: string): Promise<void> | void
  /** Forgets the account's failures from every address; answers how many addresses had some. */
  clearAccount(account: string): Promise<number> | number
}

/** Failures are forgotten a day after the last one. */
const FAILURE_MEMORY_MS = 24 * 60 * 60 * 1000
/** Beyond this many remembered accounts the least recently seen are dropped, so made-up e-mails cannot fill the memory. */
const MAX_ACCOUNTS = 50_000
/** Addresses remembered per account (an attack spread wider only loses its oldest records). */
const MAX_ADDRESSES_PER_ACCOUNT = 1_000

export class MemorySigninFailureStore implements SigninFailureStore {
  private readonly accounts = new LRUCache<string, Map<string, FailureRecord>>({ max: MAX_ACCOUNTS })

  get(account: string, address: string): FailureRecord | null {
    return this.accounts.get(account)?.get(address) ?? null
  }

  increment(account: string, address: string, now: number, ttlMs: number): FailureRecord {
    let byAddress = this.accounts.get(account)
    if (!byAddress) this.accounts.set(account, (byAddress = new Map()))
    const old = byAddress.get(address)
    const fresh = old && now - old.lastFailureAt < ttlMs ? old.failures : 0
    // re-inserted so the Map stays oldest-first for the eviction below
    byAddress.delete(address)
    const record = { failures: fresh + 1, lastFailureAt: now }
    byAddress.set(address, record)
    if (byAddress.size > MAX_ADDRESSES_PER_ACCOUNT) byAddress.delete(byAddress.keys().next().value as string)
    return record
  }

  clear(account: string, address: string): void {
    const byAddress = this.accounts.get(account)
    byAddress?.delete(address)
    if (byAddress && byAddress.size === 0) this.accounts.delete(account)
  }

  clearAccount(account: string): number {
    const n = this.accounts.get(account)?.size ?? 0
    this.accounts.delete(account)
    return n
  }
}

export function normalizeEmail(value: unknown): string | null {
  return typeof value === 'string' && value.trim() ? value.trim().toLowerCase() : null
}

/** The wait after `failures` failures, ms (0 while within the free ones). */
export function delayAfter(settings: LockoutSettings, failures: number): number {
  const beyond = failures - settings.failures
  if (beyond < 0) return 0
  // 2^beyond overflows to Infinity long before it matters; the cap takes over
  return Math.min(settings.lockMs, settings.baseDelayMs * 2 ** Math.min(beyond, 40))
}

export class SigninGuard {
  constructor(
    readonly settings: LockoutSettings,
    readonly store: SigninFailureStore = new MemorySigninFailureStore(),
    private readonly now: () => number = Date.now,
  ) {}

  /** Milliseconds this address must still wait before trying this account again, or 0. */
  async waitFor(account: string, address: string): Promise<number> {
    const record = await this.store.get(account, address)
    if (!record) return 0
    const elapsed = this.now() - record.lastFailureAt
    if (elapsed >= FAILURE_MEMORY_MS) return 0
    return Math.max(0, delayAfter(this.settings, record.failures) - elapsed)
  }

  /** Throws 429 rate_limited with Retry-After while the address must wait for this account. */
  async assertAllowed(account: string, address: string): Promise<void> {
    const ms = await this.waitFor(account, address)
    if (ms <= 0) return
    const seconds = Math.ceil(ms / 1000)
    throw new HttpError(
      429,
      'rate_limited',
      `too many wrong passwords for this account from your address; try again in ${describeWait(seconds)} (other addresses are not affected; an admin can unlock the account)`,
      { retryAfterSeconds: seconds },
    )
  }

  async failed(account: string, address: string): Promise<void> {
    await this.store.increment(account, address, this.now(), FAILURE_MEMORY_MS)
  }

  async succeeded(account: string, address: string): Promise<void> {
    await this.store.clear(account, address)
  }

  /** Clears the account's delays from every address; answers how many addresses had failures. */
  async unlock(account: string): Promise<number> {
    return this.store.clearAccount(account)
  }
}

function describeWait(seconds: number): string {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? '' : 's'}`
  const minutes = Math.ceil(seconds / 60)
  return `${minutes} minutes`
}

/** Stores for the guards of one app; the Redis ones come from installGuardStores. */
export interface GuardStores {
  failures?: SigninFailureStore
  /** An express-rate-limit store per limit (signin, signup, search); memory when absent. */
  rateLimit?: (name: 'signin' | 'signup' | 'search') => Store
}

const installed = new WeakMap<AppContext['db'], GuardStores>()
const guards = new WeakMap<AppContext['db'], SigninGuard>()

/** Plugs shared stores in for an app; call before createApp. */
export function installGuardStores(context: AppContext, stores: GuardStores): void {
  installed.set(context.db, stores)
  guards.delete(context.db)
}

export function guardStores(context: AppContext): GuardStores {
  return installed.get(context.db) ?? {}
}

/** The app's one sign-in guard (one per database, so every router and service of an app shares it). */
export function signinGuard(context: AppContext): SigninGuard {
  let guard = guards.get(context.db)
  if (!guard) guards.set(context.db, (guard = new SigninGuard(context.config.signinLockout, guardStores(context).failures)))
  return guard
}

export interface UnlockResult {
  user: UserView
  /** Addresses whose delays were cleared. */
  cleared: number
}

/**
 * Clears every sign-in delay of a user (an admin's POST /api/users/:id/unlock, or the admin
 * command line with no actor), and records who did it in the audit log.
 */
export async function unlockUser(context: AppContext, actor: User | null, userId: number, via: 'api' | 'cli' = 'api'): Promise<UnlockResult> {
  const { User } = context.db.models
  const user = await User.findByPk(userId)
  if (!user) throw notFound('user')
  const cleared = await signinGuard(context).unlock(user.email.toLowerCase())
  await context.db.write(async (transaction) => {
    await recordAudit(context, transaction, {
      actorId: actor?.id ?? null, action: 'user.unlock', subjectType: 'user', subjectId: user.id, details: { email: user.email, cleared, via },
    })
  })
  return { user: toUserView(user), cleared }
}
