/**
 * A test report keeps its comparison with the prediction (features and modulus fit), made
 * once at upload, so entry pages and the review queue read it instead of refitting every
 * report on every request (issue 11). Reports uploaded before keep null and are compared
 * when read, as before.
 */
import { DataTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

export async function up({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('TestReports', 'comparison', { type: DataTypes.JSON, allowNull: true }, { transaction })
    await queryInterface.addColumn('TestReports', 'comparisonProblem', { type: DataTypes.TEXT, allowNull: true }, { transaction })
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    for (const column of ['comparisonProblem', 'comparison']) await queryInterface.removeColumn('TestReports', column, { transaction })
  })
}
