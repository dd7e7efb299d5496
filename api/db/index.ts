import type { Sequelize } from 'sequelize'
import { openSequelize } from './connection'
import { migrate } from './migrate'
import { defineModels, type Models } from './models'
import { createWriteQueue, type WriteFn } from './write-queue'

export interface Database {
  sequelize: Sequelize
  models: Models
  /** Runs one write transaction (BEGIN IMMEDIATE), one at a time. */
  write: WriteFn
  close(): Promise<void>
}

/** Opens the database file and applies pending migrations. */
export async function openDatabase(databaseFile: string): Promise<Database> {
  const sequelize = openSequelize(databaseFile)
  await migrate(sequelize)
  const models = defineModels(sequelize)
  return { sequelize, models, write: createWriteQueue(sequelize), close: () => sequelize.close() }
}

export type { Models }
export * from './models'
