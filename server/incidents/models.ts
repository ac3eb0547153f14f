import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { RuleSeverity, WatchRuleSpec } from '@shared/rules/schema'

export class WatchRule extends Model<InferAttributes<WatchRule>, InferCreationAttributes<WatchRule>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare tankId: number | null
  declare overridesRuleId: CreationOptional<number | null>
  declare name: string
  declare severity: RuleSeverity
  declare spec: WatchRuleSpec
  declare enabled: CreationOptional<boolean>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    WatchRule.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: true },
        overridesRuleId: { type: DataTypes.INTEGER, allowNull: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        severity: { type: DataTypes.TEXT, allowNull: false },
        spec: { type: DataTypes.JSONB, allowNull: false },
        enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'watch_rules' },
    )
  }
}

export type IncidentState = 'open' | 'acknowledged' | 'resolved'

export class Incident extends Model<InferAttributes<Incident>, InferCreationAttributes<Incident>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare tankId: number
  declare ruleId: number | null
  declare ruleKind: string
  declare metric: string
  declare severity: RuleSeverity
  declare title: string
  declare state: IncidentState
  declare conditionSince: Date
  declare openedAt: Date
  declare firstValue: number | null
  declare peakValue: number | null
  declare latestValue: number | null
  declare latestAt: Date | null
  declare snoozed: CreationOptional<boolean>
  declare acknowledgedAt: CreationOptional<Date | null>
  declare acknowledgedBy: CreationOptional<number | null>
  declare acknowledgeNote: CreationOptional<string | null>
  declare resolvedAt: CreationOptional<Date | null>
  declare resolvedBy: CreationOptional<number | null>
  declare resolveNote: CreationOptional<string | null>
  declare escalationLevel: CreationOptional<number>
  declare nextEscalationAt: CreationOptional<Date | null>
  declare nextRepeatAt: CreationOptional<Date | null>
  /** The highest severity this incident has reached; a rise above it is news, a return to it is not. */
  declare topSeverity: CreationOptional<RuleSeverity>
  declare flapCount: CreationOptional<number>
  declare lastFlapAt: CreationOptional<Date | null>
  /** Resolved: a trip before this reopens the incident instead of opening another. */
  declare settleUntil: CreationOptional<Date | null>
  /** Resolved: when the all-clear mail goes, if nothing reopened it. */
  declare allClearAt: CreationOptional<Date | null>
  /** Reopened by a flap: mailed again only if it still holds at this time. */
  declare recheckAt: CreationOptional<Date | null>
  /** The first mail waits until then, in case other tanks of the site follow (one site incident). */
  declare notifyAt: CreationOptional<Date | null>
  /** Opened inside a maintenance window: recorded, nobody told until the window ends. */
  declare maintenance: CreationOptional<boolean>
  declare cause: CreationOptional<string | null>
  declare siteIncidentId: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    // Fresh objects each time: Sequelize writes the column name into an attribute's definition.
    const nullableDate = () => ({ type: DataTypes.DATE, allowNull: true })
    const nullableNumber = () => ({ type: DataTypes.DOUBLE, allowNull: true })
    Incident.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        ruleId: { type: DataTypes.INTEGER, allowNull: true },
        ruleKind: { type: DataTypes.TEXT, allowNull: false },
        metric: { type: DataTypes.TEXT, allowNull: false },
        severity: { type: DataTypes.TEXT, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false },
        conditionSince: { type: DataTypes.DATE, allowNull: false },
        openedAt: { type: DataTypes.DATE, allowNull: false },
        firstValue: nullableNumber(),
        peakValue: nullableNumber(),
        latestValue: nullableNumber(),
        latestAt: nullableDate(),
        snoozed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        acknowledgedAt: nullableDate(),
        acknowledgedBy: { type: DataTypes.INTEGER, allowNull: true },
        acknowledgeNote: { type: DataTypes.TEXT, allowNull: true },
        resolvedAt: nullableDate(),
        resolvedBy: { type: DataTypes.INTEGER, allowNull: true },
        resolveNote: { type: DataTypes.TEXT, allowNull: true },
        escalationLevel: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextEscalationAt: nullableDate(),
        nextRepeatAt: nullableDate(),
        topSeverity: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'warning' },
        flapCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lastFlapAt: nullableDate(),
        settleUntil: nullableDate(),
        allClearAt: nullableDate(),
        recheckAt: nullableDate(),
        notifyAt: nullableDate(),
        maintenance: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        cause: { type: DataTypes.TEXT, allowNull: true },
        siteIncidentId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      {
        sequelize,
        tableName: 'incidents',
        // The highest severity reached is never below the current one, whoever writes the row.
        hooks: { beforeValidate: (incident: Incident) => void (incident.severity === 'alarm' && (incident.topSeverity = 'alarm')) },
      },
    )
  }
}

export class IncidentEvent extends Model<InferAttributes<IncidentEvent>, InferCreationAttributes<IncidentEvent>> {
  declare id: CreationOptional<number>
  declare incidentId: number
  declare at: CreationOptional<Date>
  declare kind: string
  declare userId: CreationOptional<number | null>
  declare detail: CreationOptional<Record<string, unknown>>

  static initModel(sequelize: Sequelize) {
    IncidentEvent.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        incidentId: { type: DataTypes.INTEGER, allowNull: false },
        at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        kind: { type: DataTypes.TEXT, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: true },
        detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      },
      { sequelize, tableName: 'incident_events', timestamps: false },
    )
  }
}

export class Snooze extends Model<InferAttributes<Snooze>, InferCreationAttributes<Snooze>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare reason: string
  declare startsAt: Date
  declare endsAt: Date
  declare weekly: CreationOptional<boolean>
  declare repeatUntil: CreationOptional<Date | null>
  declare includeHeaterLine: CreationOptional<boolean>
  declare createdBy: number | null
  declare remindedAt: CreationOptional<Date | null>
  declare cancelledAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    Snooze.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: false },
        startsAt: { type: DataTypes.DATE, allowNull: false },
        endsAt: { type: DataTypes.DATE, allowNull: false },
        weekly: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        repeatUntil: { type: DataTypes.DATE, allowNull: true },
        includeHeaterLine: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        remindedAt: { type: DataTypes.DATE, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'snoozes' },
    )
  }
}

export class IncidentAckLink extends Model<InferAttributes<IncidentAckLink>, InferCreationAttributes<IncidentAckLink>> {
  declare id: CreationOptional<number>
  declare incidentId: number
  declare userId: number
  declare tokenHash: string
  declare expiresAt: Date
  declare usedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    IncidentAckLink.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        incidentId: { type: DataTypes.INTEGER, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        tokenHash: { type: DataTypes.TEXT, allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'incident_ack_links', updatedAt: false },
    )
  }
}
