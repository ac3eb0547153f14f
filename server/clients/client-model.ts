import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { ClientKind } from '@shared/schemas/clients'

/** Who owns tanks the business maintains (table clients). */
export class Client extends Model<InferAttributes<Client>, InferCreationAttributes<Client>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare kind: ClientKind
  declare name: string
  declare contactName: CreationOptional<string>
  declare email: CreationOptional<string>
  declare phone: CreationOptional<string>
  declare address: CreationOptional<string>
  declare notes: CreationOptional<string>
  declare archivedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    Client.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        contactName: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        email: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        phone: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        address: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'clients' },
    )
  }
}
