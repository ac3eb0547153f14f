import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { User } from '../people/user-model'

export class Calibration extends Model<InferAttributes<Calibration>, InferCreationAttributes<Calibration>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare deviceId: number
  declare metric: string
  declare method: 'ph_buffers' | 'offset' | 'factor'
  declare points: unknown
  declare gain: number
  declare intercept: number
  declare slopePercent: number | null
  declare offsetMv: number | null
  declare slopeOk: boolean | null
  declare performedAt: Date
  declare performedBy: number | null
  declare notes: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare performer?: NonAttribute<User | null>

  static initModel(sequelize: Sequelize) {
    Calibration.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        deviceId: { type: DataTypes.INTEGER, allowNull: false },
        metric: { type: DataTypes.TEXT, allowNull: false },
        method: { type: DataTypes.TEXT, allowNull: false },
        points: { type: DataTypes.JSONB, allowNull: false },
        gain: { type: DataTypes.DOUBLE, allowNull: false },
        intercept: { type: DataTypes.DOUBLE, allowNull: false },
        slopePercent: { type: DataTypes.DOUBLE, allowNull: true },
        offsetMv: { type: DataTypes.DOUBLE, allowNull: true },
        slopeOk: { type: DataTypes.BOOLEAN, allowNull: true },
        performedAt: { type: DataTypes.DATE, allowNull: false },
        performedBy: { type: DataTypes.INTEGER, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'calibrations' },
    )
  }
}
