import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { ReportPeriodKind } from '@shared/report/period'

/** A periodic client report (table report_schedules). */
export class ReportSchedule extends Model<InferAttributes<ReportSchedule>, InferCreationAttributes<ReportSchedule>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number | null
  declare siteId: number | null
  declare clientId: CreationOptional<number | null>
  declare period: ReportPeriodKind
  declare emails: CreationOptional<string[]>
  declare userIds: CreationOptional<number[]>
  declare enabled: CreationOptional<boolean>
  declare lastSentPeriod: CreationOptional<string | null>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    ReportSchedule.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: true },
        siteId: { type: DataTypes.INTEGER, allowNull: true },
        clientId: { type: DataTypes.INTEGER, allowNull: true },
        period: { type: DataTypes.TEXT, allowNull: false },
        emails: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        userIds: { type: DataTypes.ARRAY(DataTypes.INTEGER), allowNull: false, defaultValue: [] },
        enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        lastSentPeriod: { type: DataTypes.TEXT, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'report_schedules' },
    )
  }
}
