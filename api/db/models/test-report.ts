import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { EntryId, RevisionId } from './types'
import type { User } from './user'

const REPORT_STATUSES = ['submitted', 'accepted', 'rejected'] as const
export type ReportStatus = (typeof REPORT_STATUSES)[number]

export interface MeasuredCurve {
  displacement: number[]
  force: number[]
}

/** A measured curve from a test stand (CSV under uploads/), optional photo and print details. */
export class TestReport extends Model<InferAttributes<TestReport>, InferCreationAttributes<TestReport>> {
  declare id: CreationOptional<number>
  declare entryId: ForeignKey<EntryId>
  declare revisionId: ForeignKey<RevisionId> | null
  declare uploaderId: ForeignKey<User['id']>
  declare reviewerId: ForeignKey<User['id']> | null
  /** Path of the uploaded file, relative to the uploads folder. */
  declare filePath: string
  declare originalName: string
  declare photoPath: string | null
  declare printer: string
  declare material: string
  declare lot: string
  declare orientation: string
  /** Test speed in mm/min. */
  declare testSpeed: number | null
  declare notes: CreationOptional<string>
  /** The librarian's note with the accept or reject decision. */
  declare reviewNote: CreationOptional<string>
  declare reviewedAt: CreationOptional<Date | null>
  declare status: CreationOptional<ReportStatus>
  declare measuredCurve: MeasuredCurve
  /** The comparison with the prediction made at upload (services/report-comparison.ts); null for reports from before it was stored. */
  declare comparison: CreationOptional<Record<string, unknown> | null>
  /** Why there is no comparison, when the upload could not make one. */
  declare comparisonProblem: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  declare uploader?: NonAttribute<User>
  declare reviewer?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize): void {
    this.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        filePath: { type: DataTypes.STRING(255), allowNull: false },
        originalName: { type: DataTypes.STRING(255), allowNull: false },
        photoPath: { type: DataTypes.STRING(255), allowNull: true },
        printer: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        material: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        lot: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        orientation: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        testSpeed: { type: DataTypes.FLOAT, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        reviewNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        reviewedAt: { type: DataTypes.DATE, allowNull: true },
        status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'submitted', validate: { isIn: [REPORT_STATUSES as unknown as string[]] } },
        measuredCurve: { type: DataTypes.JSON, allowNull: false },
        comparison: { type: DataTypes.JSON, allowNull: true },
        comparisonProblem: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'TestReport', tableName: 'TestReports' },
    )
  }
}
