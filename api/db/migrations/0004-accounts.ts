/**
 * The account life cycle: a one-time password that must be changed at first sign-in, the
 * session that changed a password (it stays signed in, the others end), the link to an
 * identity provider's account for single sign-on, and password-reset tokens (stored as
 * hashes, single use, with an expiry).
 */
import { DataTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

export async function up({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('Users', 'passwordMustChange', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false }, { transaction })
    await queryInterface.addColumn('Users', 'carriedSessionJti', { type: DataTypes.STRING(64), allowNull: true }, { transaction })
    await queryInterface.addColumn('Users', 'oidcIssuer', { type: DataTypes.STRING(255), allowNull: true }, { transaction })
    await queryInterface.addColumn('Users', 'oidcSubject', { type: DataTypes.STRING(255), allowNull: true }, { transaction })
    await queryInterface.addIndex('Users', ['oidcIssuer', 'oidcSubject'], { unique: true, name: 'users_oidc_identity', transaction })
    await queryInterface.createTable('PasswordResetTokens', {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
      userId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Users', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'CASCADE' },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
    await queryInterface.addIndex('PasswordResetTokens', ['userId'], { transaction })
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.dropTable('PasswordResetTokens', { transaction })
    await queryInterface.removeIndex('Users', 'users_oidc_identity', { transaction })
    for (const column of ['oidcSubject', 'oidcIssuer', 'carriedSessionJti', 'passwordMustChange']) await queryInterface.removeColumn('Users', column, { transaction })
  })
}
