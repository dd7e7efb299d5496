/**
 * Curation: change proposals point at the entry they would revise, review comments, a
 * librarian's note on a test report, and the outbox of notification e-mails.
 */
import { DataTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

export async function up({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('Entries', 'proposalForId', {
      type: DataTypes.INTEGER,
      allowNull: true,
      references: { model: 'Entries', key: 'id' },
      onUpdate: 'CASCADE',
      onDelete: 'CASCADE',
    }, { transaction })
    await queryInterface.addIndex('Entries', ['proposalForId'], { transaction })

    await queryInterface.addColumn('TestReports', 'reviewNote', { type: DataTypes.TEXT, allowNull: false, defaultValue: '' }, { transaction })
    await queryInterface.addColumn('TestReports', 'reviewedAt', { type: DataTypes.DATE, allowNull: true }, { transaction })

    await queryInterface.createTable('EntryComments', {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
      entryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Entries', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'CASCADE' },
      authorId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Users', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'RESTRICT' },
      kind: { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'comment' },
      text: { type: DataTypes.TEXT, allowNull: false },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
    await queryInterface.addIndex('EntryComments', ['entryId'], { transaction })

    await queryInterface.createTable('OutboxMessages', {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
      to: { type: DataTypes.JSON, allowNull: false },
      subject: { type: DataTypes.STRING(255), allowNull: false },
      text: { type: DataTypes.TEXT, allowNull: false },
      transport: { type: DataTypes.STRING(16), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      error: { type: DataTypes.TEXT, allowNull: true },
      at: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
    await queryInterface.addIndex('OutboxMessages', ['at'], { transaction })
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.dropTable('OutboxMessages', { transaction })
    await queryInterface.dropTable('EntryComments', { transaction })
    await queryInterface.removeColumn('TestReports', 'reviewedAt', { transaction })
    await queryInterface.removeColumn('TestReports', 'reviewNote', { transaction })
    await queryInterface.removeIndex('Entries', ['proposalForId'], { transaction })
    await queryInterface.removeColumn('Entries', 'proposalForId', { transaction })
  })
}
