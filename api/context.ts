import type { Config } from './config'
import type { Database } from './db'

/** What createApp needs: the configuration and an open, migrated database. */
export interface AppContext {
  config: Config
  db: Database
}
