/**
 * Versioned schema migrations, run with umzug and recorded in the SequelizeMeta table.
 * Add a migration as migrations/NNNN-what.ts and list it below; never edit a released one.
 */
import type { QueryInterface, Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug, type RunnableMigration } from 'umzug'
import * as initial from './migrations/0001-initial'
import * as curation from './migrations/0002-curation'
import * as savedConfigurationSettings from './migrations/0003-saved-configuration-settings'

const migrations: RunnableMigration<QueryInterface>[] = [
  { name: '0001-initial', up: initial.up, down: initial.down },
  { name: '0002-curation', up: curation.up, down: curation.down },
  { name: '0003-saved-configuration-settings', up: savedConfigurationSettings.up, down: savedConfigurationSettings.down },
]

export function createMigrator(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations,
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize }),
    logger: undefined,
  })
}

/** Applies every pending migration; returns the names applied. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const applied = await createMigrator(sequelize).up()
  return applied.map((m) => m.name)
}
