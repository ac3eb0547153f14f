import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Role } from '@shared/schemas/auth'
import type { Site } from '../sites/site-model'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare email: string
  declare name: string
  declare passwordHash: string
  declare role: Role
  /** A client's person: a viewer of exactly that client's tanks. */
  declare clientId: CreationOptional<number | null>
  declare active: CreationOptional<boolean>
  declare unitPreferences: CreationOptional<Record<string, string>>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare sites?: NonAttribute<Site[]>

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        email: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        passwordHash: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        clientId: { type: DataTypes.INTEGER, allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        unitPreferences: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users' },
    )
  }
}
