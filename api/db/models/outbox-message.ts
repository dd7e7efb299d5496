import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

const OUTBOX_STATUSES = ['sent', 'failed'] as const
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number]

/** Every notification e-mail, as handed to the transport, and whether the transport took it. */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>
  declare to: string[]
  declare subject: string
  declare text: string
  /** 'outbox' (the local fake transport) or 'smtp'. */
  declare transport: string
  declare status: OutboxStatus
  declare error: string | null
  declare at: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        to: { type: DataTypes.JSON, allowNull: false },
        subject: { type: DataTypes.STRING(255), allowNull: false },
        text: { type: DataTypes.TEXT, allowNull: false },
        transport: { type: DataTypes.STRING(16), allowNull: false },
        status: { type: DataTypes.STRING(16), allowNull: false, validate: { isIn: [OUTBOX_STATUSES as unknown as string[]] } },
        error: { type: DataTypes.TEXT, allowNull: true },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, modelName: 'OutboxMessage', tableName: 'OutboxMessages', timestamps: false },
    )
  }
}
