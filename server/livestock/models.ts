import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { BatchEventKind } from '@shared/schemas/livestock'

const optionalInt = () => ({ type: DataTypes.INTEGER, allowNull: true })
const text = () => ({ type: DataTypes.TEXT, allowNull: false, defaultValue: '' })

/** One step in a batch's life: arrival, a move between tanks, a loss, or where the animals went. */
export class LivestockEvent extends Model<InferAttributes<LivestockEvent>, InferCreationAttributes<LivestockEvent>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare livestockId: number
  declare kind: BatchEventKind
  declare at: Date
  declare count: number
  declare fromTankId: CreationOptional<number | null>
  declare toTankId: CreationOptional<number | null>
  /** The batch split off by a move of part of this one. */
  declare splitId: CreationOptional<number | null>
  declare cause: CreationOptional<string>
  declare destination: CreationOptional<string>
  declare userId: number | null
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    LivestockEvent.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        livestockId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        at: { type: DataTypes.DATE, allowNull: false },
        count: { type: DataTypes.INTEGER, allowNull: false },
        fromTankId: optionalInt(),
        toTankId: optionalInt(),
        splitId: optionalInt(),
        cause: text(),
        destination: text(),
        userId: optionalInt(),
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'livestock_events', updatedAt: false },
    )
  }
}
