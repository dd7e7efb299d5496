import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Entry } from './entry'
import type { User } from './user'

/** A plain comment, or the message that came with a review decision. */
const COMMENT_KINDS = ['comment', 'changes_requested', 'rejected'] as const
export type CommentKind = (typeof COMMENT_KINDS)[number]

/** A remark on an entry or proposal during review; never edited. */
export class EntryComment extends Model<InferAttributes<EntryComment>, InferCreationAttributes<EntryComment>> {
  declare id: CreationOptional<number>
  declare entryId: ForeignKey<Entry['id']>
  declare authorId: ForeignKey<User['id']>
  declare kind: CommentKind
  declare text: string
  declare createdAt: CreationOptional<Date>

  declare author?: NonAttribute<User>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        kind: { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'comment', validate: { isIn: [COMMENT_KINDS as unknown as string[]] } },
        text: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'EntryComment', tableName: 'EntryComments', updatedAt: false },
    )
  }
}
