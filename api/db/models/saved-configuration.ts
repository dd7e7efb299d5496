import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize,
} from 'sequelize'
import type { EntryId, ParamValues, RevisionId } from './types'
import type { User } from './user'

/** A force window an engineer configured against: forces N, displacements mm. */
export interface ForceWindow {
  [key: string]: number | null | undefined
}

/** An engineer's configured module, optionally shared by a link token. */
export class SavedConfiguration extends Model<InferAttributes<SavedConfiguration>, InferCreationAttributes<SavedConfiguration>> {
  declare id: CreationOptional<number>
  declare ownerId: ForeignKey<User['id']>
  declare entryId: ForeignKey<EntryId>
  declare revisionId: ForeignKey<RevisionId> | null
  declare name: string
  declare params: ParamValues
  declare window: ForceWindow | null
  /** Method id the configuration was checked with; null for the family's default. */
  declare method: string | null
  /** ± wall thickness (mm) and ± modulus fraction; null for the common-practice default. */
  declare tolerance: { thickness: number; modulus: number } | null
  /** Nozzle and layer height (mm); null for the common-practice default printer. */
  declare printer: { nozzle?: number; layer?: number } | null
  declare shareToken: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        params: { type: DataTypes.JSON, allowNull: false },
        window: { type: DataTypes.JSON, allowNull: true },
        method: { type: DataTypes.STRING(64), allowNull: true },
        tolerance: { type: DataTypes.JSON, allowNull: true },
        printer: { type: DataTypes.JSON, allowNull: true },
        shareToken: { type: DataTypes.STRING(64), allowNull: true, unique: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'SavedConfiguration', tableName: 'SavedConfigurations' },
    )
  }
}
