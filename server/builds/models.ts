import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { BuildPlan } from '@shared/schemas/build'

/** A tank's build plan and fill date (table tank_builds). */
export class TankBuild extends Model<InferAttributes<TankBuild>, InferCreationAttributes<TankBuild>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare plan: BuildPlan
  declare filledOn: CreationOptional<string | null>
  declare finishedAt: CreationOptional<Date | null>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    TankBuild.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        plan: { type: DataTypes.JSONB, allowNull: false },
        filledOn: { type: DataTypes.DATEONLY, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'tank_builds' },
    )
  }
}

/** One dated step of a build's timeline (table build_steps). */
export class BuildStep extends Model<InferAttributes<BuildStep>, InferCreationAttributes<BuildStep>> {
  declare id: CreationOptional<number>
  declare buildId: number
  declare tankId: number
  declare key: string
  declare title: string
  declare day: number
  declare untilDay: number | null
  declare dueOn: string
  declare careTaskId: CreationOptional<number | null>
  declare doneAt: CreationOptional<Date | null>
  declare doneBy: CreationOptional<number | null>
  declare notes: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    BuildStep.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        buildId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        key: { type: DataTypes.TEXT, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        day: { type: DataTypes.INTEGER, allowNull: false },
        untilDay: { type: DataTypes.INTEGER, allowNull: true },
        dueOn: { type: DataTypes.DATEONLY, allowNull: false },
        careTaskId: { type: DataTypes.INTEGER, allowNull: true },
        doneAt: { type: DataTypes.DATE, allowNull: true },
        doneBy: { type: DataTypes.INTEGER, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'build_steps' },
    )
  }
}
