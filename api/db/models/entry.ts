import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { EntryRevision } from './entry-revision'
import type { TestReport } from './test-report'
import { ENTRY_STATUSES, type EntryStatus, type ParamRanges, type ParamValues } from './types'
import type { User } from './user'

/** One shelf entry: a module family with curated defaults, allowed ranges and materials. */
export class Entry extends Model<InferAttributes<Entry>, InferCreationAttributes<Entry>> {
  declare id: CreationOptional<number>
  declare familyId: string
  declare name: string
  declare summary: string
  declare tags: string[]
  declare status: EntryStatus
  declare defaultParams: ParamValues
  declare ranges: ParamRanges
  /** Material ids the entry is released for. */
  declare materials: string[]
  declare notes: CreationOptional<string>
  declare ownerId: ForeignKey<User['id']>
  declare currentRevisionId: ForeignKey<EntryRevision['id']> | null
  /** Set on a change proposal: the released entry it would revise. */
  declare proposalForId: CreationOptional<ForeignKey<Entry['id']> | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  declare owner?: NonAttribute<User>
  declare currentRevision?: NonAttribute<EntryRevision | null>
  declare proposalFor?: NonAttribute<Entry | null>
  declare revisions?: NonAttribute<EntryRevision[]>
  declare reports?: NonAttribute<TestReport[]>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        familyId: { type: DataTypes.STRING(64), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        summary: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        tags: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft', validate: { isIn: [ENTRY_STATUSES as unknown as string[]] } },
        defaultParams: { type: DataTypes.JSON, allowNull: false, defaultValue: {} },
        ranges: { type: DataTypes.JSON, allowNull: false, defaultValue: {} },
        materials: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Entry', tableName: 'Entries' },
    )
  }
}
