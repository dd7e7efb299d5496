import type { Sequelize } from 'sequelize'
import { openSequelize, type PostgresOptions } from './connection'
import { migrate } from './migrate'
import { defineModels, type Models } from './models'
import { createWriteQueue, type WriteFn } from './write-queue'

export interface Database {
  sequelize: Sequelize
  models: Models
  /** Runs one write transaction (SQLite: BEGIN IMMEDIATE, one at a time; PostgreSQL: SERIALIZABLE, run again on a conflict). */
  write: WriteFn
  close(): Promise<void>
}

/**
 * Opens the database (an SQLite file path, or a postgres:// URL) and applies pending
 * migrations. Several instances starting at once against PostgreSQL are safe: migrate()
 * holds an advisory lock while it runs.
 */
export async function openDatabase(target: string, options: PostgresOptions = {}): Promise<Database> {
  const sequelize = openSequelize(target, options)
  await migrate(sequelize)
  const models = defineModels(sequelize)
  return { sequelize, models, write: createWriteQueue(sequelize), close: () => sequelize.close() }
}

export * from './models'
