import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A signed-out token's id, kept until the token would have expired anyway. */
export class RevokedToken extends Model<InferAttributes<RevokedToken>, InferCreationAttributes<RevokedToken>> {
  declare jti: string
  declare expiresAt: Date

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        jti: { type: DataTypes.STRING(64), primaryKey: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, modelName: 'RevokedToken', tableName: 'RevokedTokens', timestamps: false },
    )
  }
}
