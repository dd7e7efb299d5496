/** Redis connections (FLEXSHELF_REDIS_URL) with the settings every part of Flexshelf uses. */
import { Redis } from 'ioredis'

/** BullMQ needs maxRetriesPerRequest null: its blocking commands wait for Redis to come back rather than fail. */
export function connectRedis(url: string, name: string): Redis {
  return new Redis(url, { maxRetriesPerRequest: null, connectionName: `flexshelf-${name}` })
}
