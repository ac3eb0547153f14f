import { Model, type Sequelize } from 'sequelize'

/** Placeholder: the duty-roster work fills these in (tables duty_shifts, duty_overrides). */
export class DutyShift extends Model {
  static initModel(sequelize: Sequelize) {
    DutyShift.init({}, { sequelize, tableName: 'duty_shifts' })
  }
}
export class DutyOverride extends Model {
  static initModel(sequelize: Sequelize) {
    DutyOverride.init({}, { sequelize, tableName: 'duty_overrides' })
  }
}
