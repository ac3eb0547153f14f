import { Model, type Sequelize } from 'sequelize'

/** Placeholder: the mail work fills this in (table mail_outbox). */
export class OutboxMessage extends Model {
  static initModel(sequelize: Sequelize) {
    OutboxMessage.init({}, { sequelize, tableName: 'mail_outbox' })
  }
}
