import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { CourseTest, LabelDose } from '@shared/care/treatment'

export class TreatmentCourse extends Model<InferAttributes<TreatmentCourse>, InferCreationAttributes<TreatmentCourse>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare product: string
  declare dose: LabelDose
  declare days: number
  declare doseEveryDays: number
  declare startsOn: string
  declare endsOn: string
  declare tests: CourseTest[]
  declare notes: CreationOptional<string>
  declare stoppedAt: CreationOptional<Date | null>
  declare stoppedBy: CreationOptional<number | null>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare author?: NonAttribute<{ id: number; name: string } | null>

  static initModel(sequelize: Sequelize) {
    TreatmentCourse.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        tankId: { type: DataTypes.INTEGER, allowNull: false },
        product: { type: DataTypes.TEXT, allowNull: false },
        dose: { type: DataTypes.JSONB, allowNull: false },
        days: { type: DataTypes.INTEGER, allowNull: false },
        doseEveryDays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        startsOn: { type: DataTypes.DATEONLY, allowNull: false },
        endsOn: { type: DataTypes.DATEONLY, allowNull: false },
        tests: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        stoppedAt: { type: DataTypes.DATE, allowNull: true },
        stoppedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'treatment_courses' },
    )
  }
}
