/**
 * State that several API instances must agree on, kept in Redis when FLEXSHELF_REDIS_URL is
 * set (one process needs none of it):
 * - the rate limits' counts (rate-limit-redis), so a client cannot spread a flood over instances;
 * - the sign-in failure counts behind the growing delays (signin-guard.ts), in one hash per account;
 * - the read cache's invalidation: each instance publishes the tables its committed writes
 *   touched and counts the others' (read-cache.ts), so no instance serves an answer another has
 *   made stale for longer than the message takes.
 */
import { randomBytes } from 'node:crypto'
import type { Redis } from 'ioredis'
import { RedisStore, type RedisReply } from 'rate-limit-redis'
import type { AppContext } from '../context'
import { readCache, type TableName } from './read-cache'
import { connectRedis } from './redis'
import { installGuardStores, type FailureRecord, type SigninFailureStore } from './signin-guard'

const PREFIX = 'flexshelf:'
const WRITES_CHANNEL = `${PREFIX}writes`

/** Failures per account as one hash: field = address, value = "failures:lastFailureAt"; the key expires a day after the last failure. */
class RedisSigninFailureStore implements SigninFailureStore {
  constructor(private readonly redis: Redis) {}

  private key(account: string): string {
    return `${PREFIX}signin-failures:${account}`
  }

  async get(account: string, address: string): Promise<FailureRecord | null> {
    const value = await this.redis.hget(this.key(account), address)
    if (!value) return null
    const [failures, lastFailureAt] = value.split(':').map(Number)
    return { failures, lastFailureAt }
  }

  async increment(account: string, address: string, now: number, ttlMs: number): Promise<FailureRecord> {
    // read, count and write in one script so two instances counting at once lose neither failure
    const value = await this.redis.eval(
      `local old = redis.call('HGET', KEYS[1], ARGV[1])
       local n = 0
       if old then
         local sep = string.find(old, ':')
         local failures = tonumber(string.sub(old, 1, sep - 1))
         local last = tonumber(string.sub(old, sep + 1))
         if tonumber(ARGV[2]) - last < tonumber(ARGV[3]) then n = failures end
       end
       local value = (n + 1) .. ':' .. ARGV[2]
       redis.call('HSET', KEYS[1], ARGV[1], value)
       redis.call('PEXPIRE', KEYS[1], ARGV[3])
       return value`,
      1, this.key(account), address, String(now), String(ttlMs),
    ) as string
    const [failures, lastFailureAt] = value.split(':').map(Number)
    return { failures, lastFailureAt }
  }

  async clear(account: string, address: string): Promise<void> {
    await this.redis.hdel(this.key(account), address)
  }

  async clearAccount(account: string): Promise<number> {
    const [[, n]] = (await this.redis.multi().hlen(this.key(account)).del(this.key(account)).exec()) as Array<[Error | null, number]>
    return n
  }
}

/**
 * Only the sign-in failure counts, for a process that is not an API instance (the admin command
 * line's `unlock`): clearing them here clears them for every instance. Answers the closer.
 */
export function connectSigninFailureStore(context: AppContext, url: string): { close(): Promise<void> } {
  const redis = connectRedis(url, 'admin-cli')
  installGuardStores(context, { failures: new RedisSigninFailureStore(redis) })
  return { close: async () => { await redis.quit().catch(() => undefined) } }
}

export interface SharedState {
  redis: Redis
  close(): Promise<void>
}

/**
 * Plugs Redis in for one app: call before createApp. Answers the connections to close at
 * shutdown. The subscriber is a connection of its own (a subscribed connection can do nothing else).
 */
export async function connectSharedState(context: AppContext, url: string): Promise<SharedState> {
  const redis = connectRedis(url, 'api')
  const subscriber = connectRedis(url, 'api-subscriber')
  const instance = randomBytes(8).toString('hex')

  installGuardStores(context, {
    failures: new RedisSigninFailureStore(redis),
    rateLimit: (name) => new RedisStore({
      prefix: `${PREFIX}rate-limit:${name}:`,
      sendCommand: (command: string, ...args: string[]) => redis.call(command, ...args) as Promise<RedisReply>,
    }),
  })

  const cache = readCache(context.db)
  await subscriber.subscribe(WRITES_CHANNEL)
  subscriber.on('message', (_channel: string, message: string) => {
    const [from, table] = message.split(' ')
    if (from !== instance) cache.writtenElsewhere(table as TableName)
  })
  cache.announceWritesTo((table) => {
    // while Redis is unreachable the others keep their cached answers of this table until a later write reaches them
    redis.publish(WRITES_CHANNEL, `${instance} ${table}`).catch(() => undefined)
  })

  return {
    redis,
    async close() {
      cache.announceWritesTo(null)
      await Promise.allSettled([subscriber.quit(), redis.quit()])
    },
  }
}
