import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { TankKind, TankStage, TankShapeInput, Targets } from '@shared/schemas/tanks'
import type { Site } from '../sites/site-model'

export type HeaterSpec = { watts: number; setPointC: number; topCm: number }
export type LightSchedule = { on: string; off: string }

export class Tank extends Model<InferAttributes<Tank>, InferCreationAttributes<Tank>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare clientId: CreationOptional<number | null>
  declare name: string
  declare kind: TankKind
  declare stage: TankStage
  declare dimensions: TankShapeInput | null
  declare volumeLitres: number
  declare volumeSource: 'dimensions' | 'entered'
  declare substrateDepthCm: number
  declare heater: HeaterSpec | null
  declare filter: string
  declare media: string
  declare lightSchedule: LightSchedule | null
  declare targets: Targets
  declare notes: string
  declare sortOrder: number
  declare archivedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare site?: NonAttribute<Site>
  declare client?: NonAttribute<{ id: number; name: string } | null>

  static initModel(sequelize: Sequelize) {
    Tank.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        clientId: { type: DataTypes.INTEGER, allowNull: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        stage: { type: DataTypes.TEXT, allowNull: false },
        dimensions: { type: DataTypes.JSONB, allowNull: true },
        volumeLitres: { type: DataTypes.DOUBLE, allowNull: false },
        volumeSource: { type: DataTypes.TEXT, allowNull: false },
        substrateDepthCm: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        heater: { type: DataTypes.JSONB, allowNull: true },
        filter: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        media: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        lightSchedule: { type: DataTypes.JSONB, allowNull: true },
        targets: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'tanks' },
    )
  }
}
