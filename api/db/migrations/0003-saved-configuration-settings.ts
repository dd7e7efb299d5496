/**
 * Saved configurations remember everything the engineer checked against: the method, the
 * manufacturing tolerance and the printer profile, beside the parameters and force window.
 */
import { DataTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

export async function up({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('SavedConfigurations', 'method', { type: DataTypes.STRING(64), allowNull: true }, { transaction })
    await queryInterface.addColumn('SavedConfigurations', 'tolerance', { type: DataTypes.JSON, allowNull: true }, { transaction })
    await queryInterface.addColumn('SavedConfigurations', 'printer', { type: DataTypes.JSON, allowNull: true }, { transaction })
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    for (const column of ['printer', 'tolerance', 'method']) await queryInterface.removeColumn('SavedConfigurations', column, { transaction })
  })
}
