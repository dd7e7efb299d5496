import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A curated material; moduli in MPa, strain limits as fractions (0.02 = 2 %), density g/cm³. */
export class Material extends Model<InferAttributes<Material>, InferCreationAttributes<Material>> {
  /** A slug such as "petg", the id the catalog's `material` parameter names. */
  declare id: string
  declare name: string
  declare process: string
  declare modulus: number
  /** Poisson's ratio (the wide-beam correction reads it). */
  declare poissonRatio: number
  /** Where Poisson's ratio comes from. */
  declare poissonRatioSource: string
  declare strainLimit: number
  declare density: number
  declare notes: CreationOptional<string>
  /** Where the modulus and strain limit come from. */
  declare source: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.STRING(64), primaryKey: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        process: { type: DataTypes.STRING(40), allowNull: false },
        modulus: { type: DataTypes.FLOAT, allowNull: false },
        poissonRatio: { type: DataTypes.FLOAT, allowNull: false },
        poissonRatioSource: { type: DataTypes.TEXT, allowNull: false },
        strainLimit: { type: DataTypes.FLOAT, allowNull: false },
        density: { type: DataTypes.FLOAT, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        source: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Material', tableName: 'Materials' },
    )
  }
}
