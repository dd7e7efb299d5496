import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { User } from './user'

/** Who did what to which record, and when; written in the same transaction as the change. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>
  declare actorId: ForeignKey<User['id']> | null
  declare action: string
  declare subjectType: string
  declare subjectId: string
  declare details: Record<string, unknown>
  declare at: CreationOptional<Date>

  declare actor?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        action: { type: DataTypes.STRING(64), allowNull: false },
        subjectType: { type: DataTypes.STRING(40), allowNull: false },
        subjectId: { type: DataTypes.STRING(64), allowNull: false },
        details: { type: DataTypes.JSON, allowNull: false, defaultValue: {} },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, modelName: 'AuditEvent', tableName: 'AuditEvents', timestamps: false },
    )
  }
}
