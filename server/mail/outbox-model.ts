import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { MailKind, MailStatus, OutboxAttachment, ReceivedAttachment } from './types'

/** One mail waiting in, or delivered from, the transactional outbox (table mail_outbox). */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>
  declare organizationId: number | null
  declare kind: MailKind
  declare toAddress: string
  declare subject: string
  declare textBody: string
  declare htmlBody: string | null
  declare attachments: CreationOptional<OutboxAttachment[]>
  declare incidentId: number | null
  declare dedupeKey: string
  declare status: CreationOptional<MailStatus>
  declare attempts: CreationOptional<number>
  declare nextAttemptAt: CreationOptional<Date>
  declare lastError: CreationOptional<string | null>
  declare sentAt: CreationOptional<Date | null>
  declare smtpMessageId: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    OutboxMessage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.TEXT, allowNull: false },
        toAddress: { type: DataTypes.TEXT, allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false },
        textBody: { type: DataTypes.TEXT, allowNull: false },
        htmlBody: { type: DataTypes.TEXT, allowNull: true },
        attachments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        incidentId: { type: DataTypes.INTEGER, allowNull: true },
        dedupeKey: { type: DataTypes.TEXT, allowNull: false, unique: true },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        smtpMessageId: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'mail_outbox' },
    )
  }
}

/** One message the local fake SMTP server received (table fake_mailbox; development and tests). */
export class FakeMailboxMessage extends Model<InferAttributes<FakeMailboxMessage>, InferCreationAttributes<FakeMailboxMessage>> {
  declare id: CreationOptional<number>
  declare receivedAt: CreationOptional<Date>
  declare organizationId: number | null
  declare envelopeFrom: string | null
  declare envelopeTo: string[]
  declare subject: string | null
  declare textBody: string | null
  declare htmlBody: string | null
  declare headers: Record<string, string>
  declare attachments: ReceivedAttachment[]
  declare rawSize: number

  static initModel(sequelize: Sequelize) {
    FakeMailboxMessage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        organizationId: { type: DataTypes.INTEGER, allowNull: true },
        envelopeFrom: { type: DataTypes.TEXT, allowNull: true },
        envelopeTo: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        subject: { type: DataTypes.TEXT, allowNull: true },
        textBody: { type: DataTypes.TEXT, allowNull: true },
        htmlBody: { type: DataTypes.TEXT, allowNull: true },
        headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        attachments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        rawSize: { type: DataTypes.INTEGER, allowNull: false },
      },
      { sequelize, tableName: 'fake_mailbox', timestamps: false },
    )
  }
}
