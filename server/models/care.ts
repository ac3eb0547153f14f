import { Model, type Sequelize } from 'sequelize'

/** Placeholders: the care work fills these in (tables care_tasks, care_log, livestock, water_changes). */
export class CareTask extends Model {
  static initModel(sequelize: Sequelize) {
    CareTask.init({}, { sequelize, tableName: 'care_tasks' })
  }
}
export class CareLogEntry extends Model {
  static initModel(sequelize: Sequelize) {
    CareLogEntry.init({}, { sequelize, tableName: 'care_log' })
  }
}
export class LivestockEntry extends Model {
  static initModel(sequelize: Sequelize) {
    LivestockEntry.init({}, { sequelize, tableName: 'livestock' })
  }
}
export class WaterChange extends Model {
  static initModel(sequelize: Sequelize) {
    WaterChange.init({}, { sequelize, tableName: 'water_changes' })
  }
}
