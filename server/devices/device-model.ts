import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Tank } from '../tanks/tank-model'

export class Device extends Model<InferAttributes<Device>, InferCreationAttributes<Device>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare name: string
  declare metrics: string[]
  declare intervalSeconds: number
  declare tokenHash: string
  declare lastSeenAt: CreationOptional<Date | null>
  declare lastError: CreationOptional<string | null>
  declare lastErrorAt: CreationOptional<Date | null>
  declare rejectedCount: CreationOptional<number>
  declare revokedAt: CreationOptional<Date | null>
  declare selfCalibrating: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare tank?: NonAttribute<Tank>

  static initModel(sequelize: Sequelize) {
    Device.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        metrics: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        intervalSeconds: { type: DataTypes.INTEGER, allowNull: false },
        tokenHash: { type: DataTypes.TEXT, allowNull: false },
        lastSeenAt: { type: DataTypes.DATE, allowNull: true },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        lastErrorAt: { type: DataTypes.DATE, allowNull: true },
        rejectedCount: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        selfCalibrating: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'devices' },
    )
  }
}
