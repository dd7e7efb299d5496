/**
 * The admin command line: `npm run --silent admin -- <command>`. Works on the data folder
 * of FLEXSHELF_DATA (the running server may stay up: SQLite takes one writer at a time and
 * the server waits its turn), in production too, where it is how the first admin is made.
 * Output that scripts read (a generated password or secret, `list --json`) goes to stdout;
 * everything said to the person goes to stderr. Bad input prints `field: message` and exits 1.
 */
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { ConfigError, loadConfig } from '../config'
import type { AppContext } from '../context'
import { openDatabase } from '../db'
import { HttpError } from '../errors'
import { connectSigninFailureStore } from '../services/shared-state'
import {
  addUser, generateSecret, listAccounts, removeDemoAccounts, resetPassword, setRole, unlockByEmail, type PasswordSource,
} from '../services/admin-accounts'

const USAGE = `Flexshelf admin commands (npm run --silent admin -- <command> [options]):

  add --email E --name N --role R (--password-stdin | --generate)
      add an account; --password-stdin reads the password from standard input,
      --generate prints a one-time password the person must change at first sign-in
  list [--json]                         every account with its role
  set-role --email E --role R           any role, admin included
  unlock --email E                      lift a lock after failed sign-ins (every instance's,
                                        when FLEXSHELF_REDIS_URL is set)
  reset-password --email E (--password-stdin | --generate)
                                        set a new password; ends every session of the account
  remove-demo                           delete the demo accounts (or take their passwords away
                                        where shelf records point at them), so production starts
  secret                                print a new random secret for FLEXSHELF_JWT_SECRET

Roles: engineer, contributor, librarian, admin. The data folder is FLEXSHELF_DATA (default ./data);
with FLEXSHELF_DATABASE_URL the commands work on that PostgreSQL database instead.`

class UsageError extends Error {}

function readStdin(): string {
  let text: string
  try {
    text = readFileSync(0, 'utf8')
  } catch {
    throw new UsageError('--password-stdin: nothing could be read from standard input')
  }
  // one trailing line break is the end of the line typed or echoed, not part of the password
  return text.replace(/\r?\n$/, '')
}

function passwordSource(values: { 'password-stdin'?: boolean; generate?: boolean }): PasswordSource {
  if (values['password-stdin'] && values.generate) throw new UsageError('give either --password-stdin or --generate, not both')
  if (values.generate) return { kind: 'generated' }
  if (values['password-stdin']) return { kind: 'given', password: readStdin() }
  throw new UsageError('say where the password comes from: --password-stdin (e.g. `printf %s "$PW" | npm run --silent admin -- …`) or --generate')
}

function required(values: Record<string, unknown>, name: string): string {
  const v = values[name]
  if (typeof v !== 'string' || !v.trim()) throw new UsageError(`--${name} is required`)
  return v
}

async function withDatabase<T>(work: (context: AppContext) => Promise<T>): Promise<T> {
  // the CLI signs no tokens, so it needs no JWT secret (production refuses to start the server without one)
  const config = loadConfig(process.env, { jwtSecret: 'the-admin-command-line-signs-no-tokens' })
  // the same database and (for unlock) the same shared sign-in failure counts as the servers
  const db = await openDatabase(config.databaseUrl ?? config.databaseFile)
  const context = { config, db }
  const shared = config.redisUrl ? connectSigninFailureStore(context, config.redisUrl) : null
  try {
    return await work(context)
  } finally {
    await Promise.allSettled([shared?.close(), db.close()])
  }
}

const say = (line: string) => process.stderr.write(line + '\n')

async function run(argv: string[]): Promise<void> {
  const [command, ...rest] = argv
  const { values } = parseArgs({
    args: rest,
    options: {
      email: { type: 'string' }, name: { type: 'string' }, role: { type: 'string' },
      'password-stdin': { type: 'boolean' }, generate: { type: 'boolean' }, json: { type: 'boolean' },
    },
    strict: true,
    allowPositionals: false,
  })
  switch (command) {
    case 'secret':
      process.stdout.write(generateSecret() + '\n')
      return
    case 'add': {
      const input = { email: required(values, 'email'), name: required(values, 'name'), role: values.role ?? 'engineer' }
      const source = passwordSource(values)
      const { user, oneTimePassword } = await withDatabase((c) => addUser(c, input, source))
      say(`Added ${user.displayName} <${user.email}> as ${user.role} (account ${user.id}).`)
      if (oneTimePassword) {
        say('One-time password (they choose their own at first sign-in):')
        process.stdout.write(oneTimePassword + '\n')
      }
      return
    }
    case 'list': {
      const users = await withDatabase(listAccounts)
      if (values.json) {
        const rows = users.map((u) => ({ id: u.id, email: u.email, displayName: u.displayName, role: u.role, password: Boolean(u.passwordHash), sso: Boolean(u.oidcSubject), createdAt: u.createdAt.toISOString() }))
        process.stdout.write(JSON.stringify(rows, null, 2) + '\n')
        return
      }
      const lines = users.map((u) => [String(u.id), u.email, u.displayName, u.role, [u.passwordHash ? 'password' : '', u.oidcSubject ? 'sso' : ''].filter(Boolean).join('+') || 'no sign-in'])
      const header = ['id', 'e-mail', 'name', 'role', 'signs in with']
      const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)))
      for (const row of [header, ...lines]) process.stdout.write(row.map((c, i) => c.padEnd(widths[i])).join('  ').trimEnd() + '\n')
      return
    }
    case 'set-role': {
      const { user, from } = await withDatabase((c) => setRole(c, required(values, 'email'), required(values, 'role')))
      say(from === user.role ? `${user.email} already is ${user.role}.` : `${user.email}: ${from} → ${user.role}; their open sessions have ended.`)
      return
    }
    case 'unlock': {
      const { user, shared } = await withDatabase((c) => unlockByEmail(c, required(values, 'email')))
      if (shared) say(`${user.email} is unlocked: the sign-in delays are cleared for every address.`)
      else {
        say(`Recorded the unlock of ${user.email}, but the sign-in delays live in the running server's memory, which this command cannot reach.`)
        say('Unlock from People and roles in the web app (POST /api/users/:id/unlock), or restart the server, which forgets them.')
      }
      return
    }
    case 'reset-password': {
      const email = required(values, 'email')
      const source = passwordSource(values)
      const { user, oneTimePassword } = await withDatabase((c) => resetPassword(c, email, source))
      say(`New password set for ${user.email}; their open sessions have ended.`)
      if (oneTimePassword) {
        say('One-time password (they choose their own at first sign-in):')
        process.stdout.write(oneTimePassword + '\n')
      }
      return
    }
    case 'remove-demo': {
      const { deleted, disabled } = await withDatabase(removeDemoAccounts)
      if (!deleted.length && !disabled.length) say('No demo accounts with a password here.')
      for (const e of deleted) say(`Deleted ${e}.`)
      for (const e of disabled) say(`Took the password of ${e} away (shelf records name it, so it stays as a name without sign-in).`)
      return
    }
    case undefined:
    case 'help':
    case '--help':
      say(USAGE)
      return
    default:
      throw new UsageError(`unknown command "${command}"`)
  }
}

run(process.argv.slice(2)).then(
  () => process.exit(0),
  (err: unknown) => {
    if (err instanceof HttpError) {
      const issues = (err.details?.issues as Array<{ field: string; message: string }> | undefined) ?? [{ field: (err.details?.field as string) ?? err.code, message: err.message }]
      for (const i of issues) say(`${i.field}: ${i.message}`)
    } else if (err instanceof UsageError || err instanceof ConfigError || (err as { code?: string })?.code?.startsWith?.('ERR_PARSE_ARGS')) {
      say(`${(err as Error).message}\n\n${USAGE}`)
    } else {
      say(`admin command failed: ${err instanceof Error ? err.stack : String(err)}`)
    }
    process.exit(1)
  },
)
