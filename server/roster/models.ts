import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** One weekly shift of the duty pattern; times are 'HH:MM' on the site's wall clock. */
export class DutyShift extends Model<InferAttributes<DutyShift>, InferCreationAttributes<DutyShift>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare userId: number
  /** 0 = Monday … 6 = Sunday. */
  declare weekday: number
  declare startTime: string
  declare endTime: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    DutyShift.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        weekday: { type: DataTypes.SMALLINT, allowNull: false },
        startTime: { type: DataTypes.TEXT, allowNull: false },
        endTime: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'duty_shifts' },
    )
  }
}

/** A one-off change to the pattern between two real instants. */
export class DutyOverride extends Model<InferAttributes<DutyOverride>, InferCreationAttributes<DutyOverride>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare siteId: number
  declare userId: number
  declare kind: 'add' | 'remove'
  declare startsAt: Date
  declare endsAt: Date
  declare note: CreationOptional<string>
  declare createdBy: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    DutyOverride.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        siteId: { type: DataTypes.INTEGER, allowNull: false },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        startsAt: { type: DataTypes.DATE, allowNull: false },
        endsAt: { type: DataTypes.DATE, allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'duty_overrides' },
    )
  }
}
