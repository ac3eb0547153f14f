import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { CareRecurrence } from '@shared/care/due'
import type { CareTaskKind, CareValues } from '@shared/care/defaults'
import type { CareLogKind } from '@shared/schemas/care'

// Fresh objects each time: Sequelize writes the column name into an attribute's definition.
const id = () => ({ type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true })
const requiredInt = () => ({ type: DataTypes.INTEGER, allowNull: false })
const optionalInt = () => ({ type: DataTypes.INTEGER, allowNull: true })
const optionalDate = () => ({ type: DataTypes.DATE, allowNull: true })
const optionalNumber = () => ({ type: DataTypes.DOUBLE, allowNull: true })
const text = (defaultValue = '') => ({ type: DataTypes.TEXT, allowNull: false, defaultValue })
const values = () => ({ type: DataTypes.JSONB, allowNull: false, defaultValue: {} })

export class CareTask extends Model<InferAttributes<CareTask>, InferCreationAttributes<CareTask>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare kind: CareTaskKind
  declare title: string
  declare recurrence: CareRecurrence
  declare defaultValues: CreationOptional<CareValues>
  declare startsOn: CreationOptional<string | null>
  /** The last day the task is due (a treatment course's last day); null for a standing task. */
  declare endsOn: CreationOptional<string | null>
  declare treatmentCourseId: CreationOptional<number | null>
  declare lastDoneAt: CreationOptional<Date | null>
  declare lastDoneBy: CreationOptional<number | null>
  declare snoozedUntil: CreationOptional<Date | null>
  declare snoozeReason: CreationOptional<string | null>
  declare active: CreationOptional<boolean>
  /** A consumable the task uses up, and how much each time (in the consumable's unit). */
  declare consumableId: CreationOptional<number | null>
  declare consumableAmount: CreationOptional<number | null>
  declare createdBy: CreationOptional<number | null>
  /** The probe this task belongs to (calibrating it), if any. */
  declare deviceId: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    CareTask.init(
      {
        id: id(),
        organizationId: requiredInt(),
        tankId: requiredInt(),
        kind: { type: DataTypes.TEXT, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        recurrence: { type: DataTypes.JSONB, allowNull: false },
        defaultValues: values(),
        startsOn: { type: DataTypes.DATEONLY, allowNull: true },
        endsOn: { type: DataTypes.DATEONLY, allowNull: true },
        treatmentCourseId: optionalInt(),
        lastDoneAt: optionalDate(),
        lastDoneBy: optionalInt(),
        snoozedUntil: optionalDate(),
        snoozeReason: { type: DataTypes.TEXT, allowNull: true },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        consumableId: optionalInt(),
        consumableAmount: optionalNumber(),
        createdBy: optionalInt(),
        deviceId: optionalInt(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'care_tasks' },
    )
  }
}

export class CareLogEntry extends Model<InferAttributes<CareLogEntry>, InferCreationAttributes<CareLogEntry>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare kind: CareLogKind
  declare at: Date
  declare userId: number | null
  declare text: CreationOptional<string>
  declare values: CreationOptional<CareValues>
  declare careTaskId: CreationOptional<number | null>
  declare waterChangeId: CreationOptional<number | null>
  declare clientId: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    CareLogEntry.init(
      {
        id: id(),
        organizationId: requiredInt(),
        tankId: requiredInt(),
        kind: { type: DataTypes.TEXT, allowNull: false },
        at: { type: DataTypes.DATE, allowNull: false },
        userId: optionalInt(),
        text: text(),
        values: values(),
        careTaskId: optionalInt(),
        waterChangeId: optionalInt(),
        clientId: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'care_log', updatedAt: false },
    )
  }
}

export class LivestockEntry extends Model<InferAttributes<LivestockEntry>, InferCreationAttributes<LivestockEntry>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare speciesKey: string | null
  declare name: string
  declare category: 'fish' | 'invertebrate' | 'plant'
  declare count: number
  declare losses: CreationOptional<number>
  declare addedAt: Date
  declare source: CreationOptional<string>
  declare notes: CreationOptional<string>
  declare removedAt: CreationOptional<Date | null>
  declare watchUntil: CreationOptional<Date | null>
  /** The batch this one was split from when part of it moved tanks. */
  declare parentId: CreationOptional<number | null>
  /** Animals that left alive: split off to another tank, sold, or gone to a client's tank. */
  declare movedOut: CreationOptional<number>
  declare createdBy: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    LivestockEntry.init(
      {
        id: id(),
        organizationId: requiredInt(),
        tankId: requiredInt(),
        speciesKey: { type: DataTypes.TEXT, allowNull: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        category: { type: DataTypes.TEXT, allowNull: false },
        count: requiredInt(),
        losses: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        addedAt: { type: DataTypes.DATE, allowNull: false },
        source: text(),
        notes: text(),
        removedAt: optionalDate(),
        watchUntil: optionalDate(),
        parentId: optionalInt(),
        movedOut: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdBy: optionalInt(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'livestock' },
    )
  }
}

export type WaterChangeStatus = 'in_progress' | 'finished' | 'cancelled'

export class WaterChange extends Model<InferAttributes<WaterChange>, InferCreationAttributes<WaterChange>> {
  declare id: CreationOptional<number>
  declare organizationId: number
  declare tankId: number
  declare status: WaterChangeStatus
  declare plan: Record<string, unknown>
  declare heaterOffConfirmed: boolean
  declare temporaryRuleId: CreationOptional<number | null>
  declare startedAt: Date
  declare startedBy: number | null
  declare finishedAt: CreationOptional<Date | null>
  declare finishedBy: CreationOptional<number | null>
  declare litresReplaced: CreationOptional<number | null>
  declare dechlorinatorMl: CreationOptional<number | null>
  declare newWaterTempC: CreationOptional<number | null>
  declare careLogEntryId: CreationOptional<number | null>
  declare cancelledAt: CreationOptional<Date | null>
  declare cancelledBy: CreationOptional<number | null>
  declare cancelReason: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize) {
    WaterChange.init(
      {
        id: id(),
        organizationId: requiredInt(),
        tankId: requiredInt(),
        status: { type: DataTypes.TEXT, allowNull: false },
        plan: { type: DataTypes.JSONB, allowNull: false },
        heaterOffConfirmed: { type: DataTypes.BOOLEAN, allowNull: false },
        temporaryRuleId: optionalInt(),
        startedAt: { type: DataTypes.DATE, allowNull: false },
        startedBy: optionalInt(),
        finishedAt: optionalDate(),
        finishedBy: optionalInt(),
        litresReplaced: optionalNumber(),
        dechlorinatorMl: optionalNumber(),
        newWaterTempC: optionalNumber(),
        careLogEntryId: optionalInt(),
        cancelledAt: optionalDate(),
        cancelledBy: optionalInt(),
        cancelReason: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'water_changes' },
    )
  }
}
