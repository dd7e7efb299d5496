import type { Sequelize } from 'sequelize'
import { AuditEvent } from './audit-event'
import { Entry } from './entry'
import { EntryComment } from './entry-comment'
import { EntryRevision } from './entry-revision'
import { Material } from './material'
import { OutboxMessage } from './outbox-message'
import { PasswordResetToken } from './password-reset-token'
import { RevokedToken } from './revoked-token'
import { SavedConfiguration } from './saved-configuration'
import { TestReport } from './test-report'
import { User } from './user'

export { AuditEvent, Entry, EntryRevision, Material, SavedConfiguration, TestReport, User }
export { OutboxMessage }

export { type EntryStatus, type ParamRanges, type ParamValues } from './types'
export { ImmutableRevisionError } from './entry-revision'

/**
 * Binds the models to one database. Each database gets its own subclasses, so two
 * databases (a test's and a migration check's) can be open in one process.
 */
export function defineModels(sequelize: Sequelize) {
  const models = {
    User: class extends User {},
    Material: class extends Material {},
    Entry: class extends Entry {},
    EntryRevision: class extends EntryRevision {},
    TestReport: class extends TestReport {},
    SavedConfiguration: class extends SavedConfiguration {},
    AuditEvent: class extends AuditEvent {},
    RevokedToken: class extends RevokedToken {},
    EntryComment: class extends EntryComment {},
    OutboxMessage: class extends OutboxMessage {},
    PasswordResetToken: class extends PasswordResetToken {},
  }
  for (const model of Object.values(models)) model.initModel(sequelize)
  const m = models

  m.Entry.belongsTo(m.User, { as: 'owner', foreignKey: 'ownerId' })
  m.Entry.hasMany(m.EntryRevision, { as: 'revisions', foreignKey: 'entryId' })
  m.Entry.belongsTo(m.EntryRevision, { as: 'currentRevision', foreignKey: 'currentRevisionId', constraints: false })
  m.Entry.hasMany(m.TestReport, { as: 'reports', foreignKey: 'entryId' })
  m.EntryRevision.belongsTo(m.Entry, { as: 'entry', foreignKey: 'entryId' })
  m.EntryRevision.belongsTo(m.User, { as: 'createdBy', foreignKey: 'createdById' })
  m.TestReport.belongsTo(m.Entry, { as: 'entry', foreignKey: 'entryId' })
  m.TestReport.belongsTo(m.EntryRevision, { as: 'revision', foreignKey: 'revisionId' })
  m.TestReport.belongsTo(m.User, { as: 'uploader', foreignKey: 'uploaderId' })
  m.TestReport.belongsTo(m.User, { as: 'reviewer', foreignKey: 'reviewerId' })
  m.SavedConfiguration.belongsTo(m.User, { as: 'owner', foreignKey: 'ownerId' })
  m.SavedConfiguration.belongsTo(m.Entry, { as: 'entry', foreignKey: 'entryId' })
  m.SavedConfiguration.belongsTo(m.EntryRevision, { as: 'revision', foreignKey: 'revisionId' })
  m.AuditEvent.belongsTo(m.User, { as: 'actor', foreignKey: 'actorId' })
  m.Entry.belongsTo(m.Entry, { as: 'proposalFor', foreignKey: 'proposalForId' })
  m.Entry.hasMany(m.EntryComment, { as: 'comments', foreignKey: 'entryId' })
  m.EntryComment.belongsTo(m.User, { as: 'author', foreignKey: 'authorId' })
  m.PasswordResetToken.belongsTo(m.User, { as: 'user', foreignKey: 'userId' })
  return models
}

export type Models = ReturnType<typeof defineModels>
