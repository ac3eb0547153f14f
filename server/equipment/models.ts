import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { ConsumableKind, EquipmentKind, ServiceAction } from '@shared/equipment/defaults'

// Fresh objects each time: Sequelize writes the column name into an attribute's definition.
const id = () => ({ type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true })
const requiredInt = () => ({ type: DataTypes.INTEGER, allowNull: false })
const optionalInt = () => ({ type: DataTypes.INTEGER, allowNull: true })
const optionalNumber = () => ({ type: DataTypes.DOUBLE, allowNull: true })
const text = () => ({ type: DataTypes.TEXT, allowNull: false, defaultValue: '' })

export class Equipment extends Model<InferAttributes<Equipment>, InferCreationAttributes<Equipment>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare kind: EquipmentKind
  declare name: string
  declare model: CreationOptional<string>
  declare watts: CreationOptional<number | null>
  declare installedOn: string
  declare serviceAction: ServiceAction
  declare serviceEveryDays: CreationOptional<number | null>
  declare careTaskId: CreationOptional<number | null>
  declare notes: CreationOptional<string>
  declare retiredAt: CreationOptional<Date | null>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    Equipment.init(
      {
        id: id(),
        organizationId: requiredInt(),
        tankId: requiredInt(),
        kind: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        model: text(),
        watts: optionalNumber(),
        installedOn: { type: DataTypes.DATEONLY, allowNull: false },
        serviceAction: { type: DataTypes.TEXT, allowNull: false },
        serviceEveryDays: optionalInt(),
        careTaskId: optionalInt(),
        notes: text(),
        retiredAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: optionalInt(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'equipment' },
    )
  }
}

export class Consumable extends Model<InferAttributes<Consumable>, InferCreationAttributes<Consumable>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare kind: ConsumableKind
  declare name: string
  declare unit: string
  declare quantity: number
  declare lowAt: CreationOptional<number | null>
  declare expiresOn: CreationOptional<string | null>
  declare notes: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    Consumable.init(
      {
        id: id(),
        organizationId: requiredInt(),
        siteId: requiredInt(),
        kind: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        unit: { type: DataTypes.TEXT, allowNull: false },
        quantity: { type: DataTypes.DOUBLE, allowNull: false },
        lowAt: optionalNumber(),
        expiresOn: { type: DataTypes.DATEONLY, allowNull: true },
        notes: text(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'consumables' },
    )
  }
}
