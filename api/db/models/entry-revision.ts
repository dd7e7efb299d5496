import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Curve, MetricValue } from '../../../catalog'
import type { EntryId, ParamRanges, ParamValues } from './types'
import type { User } from './user'

export class ImmutableRevisionError extends Error {
  constructor() {
    super('entry revisions are immutable snapshots; create a new revision instead')
    this.name = 'ImmutableRevisionError'
  }
}

/** An immutable snapshot of an entry with the curve and metrics at its default parameters. */
export class EntryRevision extends Model<InferAttributes<EntryRevision>, InferCreationAttributes<EntryRevision>> {
  declare id: CreationOptional<number>
  declare entryId: ForeignKey<EntryId>
  declare number: number
  declare params: ParamValues
  declare ranges: ParamRanges
  declare method: string
  declare curve: Curve
  declare metrics: Record<string, MetricValue>
  declare warnings: string[]
  declare createdById: ForeignKey<User['id']>
  declare createdAt: CreationOptional<Date>

  declare createdBy?: NonAttribute<User>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.INTEGER, allowNull: false },
        params: { type: DataTypes.JSON, allowNull: false },
        ranges: { type: DataTypes.JSON, allowNull: false },
        method: { type: DataTypes.STRING(64), allowNull: false },
        curve: { type: DataTypes.JSON, allowNull: false },
        metrics: { type: DataTypes.JSON, allowNull: false },
        warnings: { type: DataTypes.JSON, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      {
        sequelize,
        modelName: 'EntryRevision',
        tableName: 'EntryRevisions',
        updatedAt: false,
        hooks: {
          beforeUpdate: () => { throw new ImmutableRevisionError() },
          beforeBulkUpdate: () => { throw new ImmutableRevisionError() },
          beforeUpsert: () => { throw new ImmutableRevisionError() },
        },
      },
    )
  }
}
