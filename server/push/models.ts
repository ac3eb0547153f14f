import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { AlertChannel } from '@shared/schemas/push'

/** One browser that may show a person's alerts (table push_subscriptions). */
export class PushSubscription extends Model<InferAttributes<PushSubscription>, InferCreationAttributes<PushSubscription>> {
  declare id: CreationOptional<number>
  declare userId: number
  declare endpoint: string
  declare p256dh: string
  declare auth: string
  declare label: string
  declare status: CreationOptional<'active' | 'expired'>
  declare expiredAt: CreationOptional<Date | null>
  declare lastSentAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    PushSubscription.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        endpoint: { type: DataTypes.TEXT, allowNull: false, unique: true },
        p256dh: { type: DataTypes.TEXT, allowNull: false },
        auth: { type: DataTypes.TEXT, allowNull: false },
        label: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'active' },
        expiredAt: { type: DataTypes.DATE, allowNull: true },
        lastSentAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'push_subscriptions' },
    )
  }
}

/** A person's choice of channel per severity (table alert_channels; no row means mail for both). */
export class AlertChannelChoice extends Model<InferAttributes<AlertChannelChoice>, InferCreationAttributes<AlertChannelChoice>> {
  declare userId: number
  declare warning: AlertChannel
  declare alarm: AlertChannel
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    AlertChannelChoice.init(
      {
        userId: { type: DataTypes.INTEGER, primaryKey: true },
        warning: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'mail' },
        alarm: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'mail' },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'alert_channels', createdAt: false },
    )
  }
}
