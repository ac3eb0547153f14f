import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { KitValue } from '@shared/schemas/test-kit'
import type { User } from '../people/user-model'

export class TestKitEntry extends Model<InferAttributes<TestKitEntry>, InferCreationAttributes<TestKitEntry>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare enteredBy: number | null
  declare takenAt: Date
  declare values: KitValue[]
  declare notes: string
  declare clientId: CreationOptional<string | null>
  declare deletedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare author?: NonAttribute<User>

  static initModel(sequelize: Sequelize) {
    TestKitEntry.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        enteredBy: { type: DataTypes.INTEGER, allowNull: true },
        takenAt: { type: DataTypes.DATE, allowNull: false },
        values: { type: DataTypes.JSONB, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        clientId: { type: DataTypes.UUID, allowNull: true },
        deletedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'test_kit_entries' },
    )
  }
}

export class TestKitEntryRevision extends Model<InferAttributes<TestKitEntryRevision>, InferCreationAttributes<TestKitEntryRevision>> {
  declare id: CreationOptional<number>
  declare entryId: number
  declare action: 'edit' | 'delete'
  declare changedBy: number | null
  declare snapshot: Record<string, unknown>
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    TestKitEntryRevision.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        entryId: { type: DataTypes.INTEGER, allowNull: false },
        action: { type: DataTypes.TEXT, allowNull: false },
        changedBy: { type: DataTypes.INTEGER, allowNull: true },
        snapshot: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'test_kit_entry_revisions', updatedAt: false },
    )
  }
}
