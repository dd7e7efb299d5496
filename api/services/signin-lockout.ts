/**
 * Account lockout after repeated failed sign-ins, on top of the per-address rate limit: the
 * rate limit slows one client guessing, the lockout stops a guess spread over many addresses.
 * After `failures` wrong passwords for one e-mail within `lockMs`, that e-mail is refused
 * (423, even with the right password) until `lockMs` has passed since the last failure; a
 * successful sign-in clears the count. Unknown e-mails are counted the same way, so the
 * answers do not tell which accounts exist.
 *
 * The counts live in memory (one server process, like the rate limit's store): a restart
 * forgets them, which at worst grants one more round of guesses.
 */
import { HttpError } from '../errors'

export interface LockoutSettings {
  /** Failed sign-ins in a row that lock the account. */
  failures: number
  /** How long the lock lasts after the last failure, and how long a failure is remembered, ms. */
  lockMs: number
}

interface FailureCount {
  count: number
  lastFailureAt: number
}

/** Beyond this many remembered e-mails the oldest are dropped, so a flood of made-up addresses cannot fill the memory. */
const MAX_TRACKED = 50_000

export function normalizeEmail(value: unknown): string | null {
  return typeof value === 'string' && value.trim() ? value.trim().toLowerCase() : null
}

export class SigninLockout {
  private readonly records = new Map<string, FailureCount>()

  constructor(private readonly settings: LockoutSettings, private readonly now: () => number = Date.now) {}

  /** Milliseconds the e-mail stays locked, or 0. */
  lockedFor(email: string): number {
    const r = this.records.get(email)
    if (!r) return 0
    const elapsed = this.now() - r.lastFailureAt
    if (elapsed >= this.settings.lockMs) {
      this.records.delete(email)
      return 0
    }
    return r.count >= this.settings.failures ? this.settings.lockMs - elapsed : 0
  }

  /** Throws 423 account_locked while the e-mail is locked. */
  assertOpen(email: string): void {
    const ms = this.lockedFor(email)
    if (ms <= 0) return
    const seconds = Math.ceil(ms / 1000)
    const minutes = Math.ceil(seconds / 60)
    throw new HttpError(
      423,
      'account_locked',
      `this account is locked after ${this.settings.failures} failed sign-ins; try again in ${minutes} minute${minutes === 1 ? '' : 's'} (or ask an admin)`,
      { retryAfterSeconds: seconds },
    )
  }

  failed(email: string): void {
    this.lockedFor(email) // forgets an expired record first
    const r = this.records.get(email)
    // re-inserted so the Map's order stays oldest-first for the eviction below
    this.records.delete(email)
    this.records.set(email, { count: (r?.count ?? 0) + 1, lastFailureAt: this.now() })
    if (this.records.size > MAX_TRACKED) this.records.delete(this.records.keys().next().value as string)
  }

  succeeded(email: string): void {
    this.records.delete(email)
  }
}
