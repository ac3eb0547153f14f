import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { ImportMapping, ImportPreview, ImportStatus } from '@shared/schemas/imports'

/** A named upload source of one organization and the mapping last confirmed for it. */
export class ImportSource extends Model<InferAttributes<ImportSource>, InferCreationAttributes<ImportSource>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare name: string
  declare mapping: ImportMapping
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    ImportSource.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        mapping: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'import_sources' },
    )
  }
}

/** One uploaded CSV file and the background import of its rows. */
export class ImportJob extends Model<InferAttributes<ImportJob>, InferCreationAttributes<ImportJob>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare createdBy: number | null
  declare siteId: number
  declare tankId: number | null
  declare sourceId: CreationOptional<number | null>
  declare fileKey: string
  declare fileName: string
  declare sizeBytes: number
  declare preview: ImportPreview | null
  declare mapping: CreationOptional<ImportMapping | null>
  declare status: ImportStatus
  declare bytesRead: CreationOptional<number>
  declare rowsRead: CreationOptional<number>
  declare rowsAccepted: CreationOptional<number>
  declare rowsDuplicate: CreationOptional<number>
  declare rowsRejected: CreationOptional<number>
  declare error: CreationOptional<string | null>
  declare hasReport: CreationOptional<boolean>
  declare startedAt: CreationOptional<Date | null>
  declare finishedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare source?: NonAttribute<ImportSource | null>

  static initModel(sequelize: Sequelize) {
    ImportJob.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: true },
        sourceId: { type: DataTypes.INTEGER, allowNull: true },
        fileKey: { type: DataTypes.TEXT, allowNull: false },
        fileName: { type: DataTypes.TEXT, allowNull: false },
        // bigint comes back from pg as a string; these stay far below 2^53.
        sizeBytes: {
          type: DataTypes.BIGINT,
          allowNull: false,
          get(this: ImportJob) {
            return Number(this.getDataValue('sizeBytes'))
          },
        },
        preview: { type: DataTypes.JSONB, allowNull: true },
        mapping: { type: DataTypes.JSONB, allowNull: true },
        status: { type: DataTypes.TEXT, allowNull: false },
        bytesRead: {
          type: DataTypes.BIGINT,
          allowNull: false,
          defaultValue: 0,
          get(this: ImportJob) {
            return Number(this.getDataValue('bytesRead'))
          },
        },
        rowsRead: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        rowsAccepted: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        rowsDuplicate: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        rowsRejected: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        error: { type: DataTypes.TEXT, allowNull: true },
        hasReport: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'import_jobs' },
    )
  }
}
