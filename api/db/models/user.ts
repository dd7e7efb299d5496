import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import { ROLES, type Role } from '../../roles'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare email: string
  declare passwordHash: string
  declare displayName: string
  declare role: Role
  /** Bumped when the role changes; tokens carrying an older version are refused. */
  declare tokenVersion: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false },
        displayName: { type: DataTypes.STRING(80), allowNull: false },
        role: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'engineer', validate: { isIn: [ROLES as unknown as string[]] } },
        tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'User', tableName: 'Users' },
    )
  }
}
