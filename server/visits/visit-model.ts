import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { VisitMaterial, VisitState, VisitTankWork } from '@shared/schemas/visits'
import type { Site } from '../sites/site-model'
import type { Client } from '../clients/client-model'
import type { User } from '../people/user-model'

/** A technician's stop at a client's site (table visits); what was done is kept on the row when it closes. */
export class Visit extends Model<InferAttributes<Visit>, InferCreationAttributes<Visit>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare clientId: number
  declare siteId: number
  declare technicianId: number
  declare startsAt: Date
  declare endsAt: Date
  declare tankIds: number[]
  declare state: CreationOptional<VisitState>
  declare arrivedAt: CreationOptional<Date | null>
  declare leftAt: CreationOptional<Date | null>
  declare notes: CreationOptional<string>
  declare materials: CreationOptional<VisitMaterial[]>
  declare work: CreationOptional<VisitTankWork[]>
  declare photoIds: CreationOptional<number[]>
  declare closedAt: CreationOptional<Date | null>
  declare closedBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare site?: NonAttribute<Site>
  declare client?: NonAttribute<Client>
  declare technician?: NonAttribute<User>

  static initModel(sequelize: Sequelize) {
    Visit.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        clientId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        technicianId: { type: DataTypes.INTEGER, allowNull: false },
        startsAt: { type: DataTypes.DATE, allowNull: false },
        endsAt: { type: DataTypes.DATE, allowNull: false },
        tankIds: { type: DataTypes.ARRAY(DataTypes.INTEGER), allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'planned' },
        arrivedAt: { type: DataTypes.DATE, allowNull: true },
        leftAt: { type: DataTypes.DATE, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        materials: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        work: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        photoIds: { type: DataTypes.ARRAY(DataTypes.INTEGER), allowNull: false, defaultValue: [] },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        closedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'visits' },
    )
  }
}
