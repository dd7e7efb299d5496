import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import { ROLES, type Role } from '../../roles'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare email: string
  /** bcrypt hash; '' for an account without a password (single sign-on only, or a removed demo account). */
  declare passwordHash: string
  declare displayName: string
  declare role: Role
  /** Bumped when the role changes; tokens carrying an older version are refused. */
  declare tokenVersion: CreationOptional<number>
  /** Set for a one-time password (admin CLI): the user must choose their own before anything else. */
  declare passwordMustChange: CreationOptional<boolean>
  /** The session that last changed the password: it keeps working although tokenVersion moved on. */
  declare carriedSessionJti: CreationOptional<string | null>
  /** The identity provider account this user signs in with (single sign-on), if any. */
  declare oidcIssuer: CreationOptional<string | null>
  declare oidcSubject: CreationOptional<string | null>
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
        passwordMustChange: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        carriedSessionJti: { type: DataTypes.STRING(64), allowNull: true },
        oidcIssuer: { type: DataTypes.STRING(255), allowNull: true },
        oidcSubject: { type: DataTypes.STRING(255), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'User', tableName: 'Users' },
    )
  }
}
