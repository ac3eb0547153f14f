import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { RuleSeverity } from '@shared/rules/schema'
import type { IncidentState } from './models'

/** One fault hitting several tanks of a site at once (a power cut): one mail, one escalation. */
export class SiteIncident extends Model<InferAttributes<SiteIncident>, InferCreationAttributes<SiteIncident>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare cause: string
  declare severity: RuleSeverity
  declare title: string
  declare state: IncidentState
  declare openedAt: Date
  declare acknowledgedAt: CreationOptional<Date | null>
  declare acknowledgedBy: CreationOptional<number | null>
  declare resolvedAt: CreationOptional<Date | null>
  declare escalationLevel: CreationOptional<number>
  declare nextEscalationAt: CreationOptional<Date | null>
  /** Its one mail waits until then, so that it lists the tanks that follow within the grouping wait. */
  declare notifyAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    SiteIncident.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        cause: { type: DataTypes.TEXT, allowNull: false },
        severity: { type: DataTypes.TEXT, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false },
        openedAt: { type: DataTypes.DATE, allowNull: false },
        acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
        acknowledgedBy: { type: DataTypes.INTEGER, allowNull: true },
        resolvedAt: { type: DataTypes.DATE, allowNull: true },
        escalationLevel: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextEscalationAt: { type: DataTypes.DATE, allowNull: true },
        notifyAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'site_incidents' },
    )
  }
}

/** Planned quiet for a site, one tank or one rule: one-off, or weekly in the site's zone. */
export class MaintenanceWindow extends Model<InferAttributes<MaintenanceWindow>, InferCreationAttributes<MaintenanceWindow>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare tankId: number | null
  declare ruleId: number | null
  declare reason: string
  declare startsAt: Date | null
  declare endsAt: Date | null
  declare weekday: number | null
  declare startMinute: number | null
  declare durationMinutes: number | null
  declare createdBy: number | null
  declare cancelledAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    MaintenanceWindow.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: true },
        ruleId: { type: DataTypes.INTEGER, allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: false },
        startsAt: { type: DataTypes.DATE, allowNull: true },
        endsAt: { type: DataTypes.DATE, allowNull: true },
        weekday: { type: DataTypes.SMALLINT, allowNull: true },
        startMinute: { type: DataTypes.SMALLINT, allowNull: true },
        durationMinutes: { type: DataTypes.INTEGER, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'maintenance_windows' },
    )
  }
}
