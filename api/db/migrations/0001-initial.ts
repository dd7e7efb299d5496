/**
 * The foundation schema: users, materials, entries with immutable revisions, test reports,
 * saved configurations, the audit log and revoked tokens.
 */
import { DataTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

const id = { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false }
const timestamps = {
  createdAt: { type: DataTypes.DATE, allowNull: false },
  updatedAt: { type: DataTypes.DATE, allowNull: false },
}
const userRef = (allowNull: boolean, onDelete: 'RESTRICT' | 'SET NULL') => ({
  type: DataTypes.INTEGER,
  allowNull,
  references: { model: 'Users', key: 'id' },
  onUpdate: 'CASCADE',
  onDelete,
})

export async function up({ context: queryInterface }: Context): Promise<void> {
  // PostgreSQL checks that a referenced table exists when the reference is declared
  const postgres = queryInterface.sequelize.getDialect() === 'postgres'
  const currentRevisionReference = {
    references: { model: 'EntryRevisions', key: 'id' },
    onUpdate: 'CASCADE',
    onDelete: 'SET NULL',
  }
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.createTable('Users', {
      id,
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      passwordHash: { type: DataTypes.STRING(100), allowNull: false },
      displayName: { type: DataTypes.STRING(80), allowNull: false },
      role: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'engineer' },
      tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      ...timestamps,
    }, { transaction })

    await queryInterface.createTable('Materials', {
      id: { type: DataTypes.STRING(64), primaryKey: true, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      process: { type: DataTypes.STRING(40), allowNull: false },
      modulus: { type: DataTypes.FLOAT, allowNull: false },
      strainLimit: { type: DataTypes.FLOAT, allowNull: false },
      density: { type: DataTypes.FLOAT, allowNull: false },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      source: { type: DataTypes.TEXT, allowNull: false },
      ...timestamps,
    }, { transaction })

    // Entries and EntryRevisions point at each other; SQLite checks a reference when a row
    // is written, so the table named by currentRevisionId may be created second. PostgreSQL
    // gets the same constraint added once EntryRevisions exists (below).
    await queryInterface.createTable('Entries', {
      id,
      familyId: { type: DataTypes.STRING(64), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      summary: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      tags: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft' },
      defaultParams: { type: DataTypes.JSON, allowNull: false, defaultValue: '{}' },
      ranges: { type: DataTypes.JSON, allowNull: false, defaultValue: '{}' },
      materials: { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      ownerId: userRef(false, 'RESTRICT'),
      currentRevisionId: {
        type: DataTypes.INTEGER,
        allowNull: true,
        ...(postgres ? {} : currentRevisionReference),
      },
      ...timestamps,
    }, { transaction })
    await queryInterface.addIndex('Entries', ['familyId'], { transaction })
    await queryInterface.addIndex('Entries', ['status'], { transaction })

    await queryInterface.createTable('EntryRevisions', {
      id,
      entryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Entries', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'CASCADE' },
      number: { type: DataTypes.INTEGER, allowNull: false },
      params: { type: DataTypes.JSON, allowNull: false },
      ranges: { type: DataTypes.JSON, allowNull: false },
      method: { type: DataTypes.STRING(64), allowNull: false },
      curve: { type: DataTypes.JSON, allowNull: false },
      metrics: { type: DataTypes.JSON, allowNull: false },
      warnings: { type: DataTypes.JSON, allowNull: false },
      createdById: userRef(false, 'RESTRICT'),
      createdAt: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
    await queryInterface.addIndex('EntryRevisions', ['entryId', 'number'], { unique: true, transaction })
    if (postgres) {
      await queryInterface.addConstraint('Entries', {
        type: 'foreign key',
        name: 'Entries_currentRevisionId_fkey',
        fields: ['currentRevisionId'],
        references: { table: 'EntryRevisions', field: 'id' },
        onUpdate: 'CASCADE',
        onDelete: 'SET NULL',
        transaction,
      })
    }

    await queryInterface.createTable('TestReports', {
      id,
      entryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Entries', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'CASCADE' },
      revisionId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'EntryRevisions', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'SET NULL' },
      uploaderId: userRef(false, 'RESTRICT'),
      reviewerId: userRef(true, 'SET NULL'),
      filePath: { type: DataTypes.STRING(255), allowNull: false },
      originalName: { type: DataTypes.STRING(255), allowNull: false },
      photoPath: { type: DataTypes.STRING(255), allowNull: true },
      printer: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      material: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      lot: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      orientation: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      testSpeed: { type: DataTypes.FLOAT, allowNull: true },
      notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'submitted' },
      measuredCurve: { type: DataTypes.JSON, allowNull: false },
      ...timestamps,
    }, { transaction })
    await queryInterface.addIndex('TestReports', ['entryId'], { transaction })

    await queryInterface.createTable('SavedConfigurations', {
      id,
      ownerId: { ...userRef(false, 'RESTRICT'), onDelete: 'CASCADE' },
      entryId: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'Entries', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'CASCADE' },
      revisionId: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'EntryRevisions', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'SET NULL' },
      name: { type: DataTypes.STRING(120), allowNull: false },
      params: { type: DataTypes.JSON, allowNull: false },
      window: { type: DataTypes.JSON, allowNull: true },
      shareToken: { type: DataTypes.STRING(64), allowNull: true, unique: true },
      ...timestamps,
    }, { transaction })
    await queryInterface.addIndex('SavedConfigurations', ['ownerId'], { transaction })

    await queryInterface.createTable('AuditEvents', {
      id,
      actorId: userRef(true, 'SET NULL'),
      action: { type: DataTypes.STRING(64), allowNull: false },
      subjectType: { type: DataTypes.STRING(40), allowNull: false },
      subjectId: { type: DataTypes.STRING(64), allowNull: false },
      details: { type: DataTypes.JSON, allowNull: false, defaultValue: '{}' },
      at: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
    await queryInterface.addIndex('AuditEvents', ['at'], { transaction })

    await queryInterface.createTable('RevokedTokens', {
      jti: { type: DataTypes.STRING(64), primaryKey: true, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
    }, { transaction })
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    if (queryInterface.sequelize.getDialect() === 'postgres') await queryInterface.removeConstraint('Entries', 'Entries_currentRevisionId_fkey', { transaction })
    for (const table of ['RevokedTokens', 'AuditEvents', 'SavedConfigurations', 'TestReports', 'EntryRevisions', 'Entries', 'Materials', 'Users']) {
      await queryInterface.dropTable(table, { transaction })
    }
  })
}
