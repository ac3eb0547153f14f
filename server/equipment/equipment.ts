import type { Transaction } from 'sequelize'
import { careDue } from '@shared/care/due'
import { ageBetween, ageText } from '@shared/equipment/age'
import { EQUIPMENT_KIND_LABELS, SERVICE_DEFAULTS } from '@shared/equipment/defaults'
import type { EquipmentInput, EquipmentReplace, EquipmentUpdate, HeaterAge, PublicEquipment } from '@shared/schemas/equipment'
import { addDays, formatLocalDate, localDateAt, parseLocalDate } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import { visibleTank } from '../access/scope'
import type { AppContext } from '../context'
import type { CareTask, Equipment } from '../models'
import { badRequest, notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'

type Zoned = { site?: { timeZone: string } }
const zoneOf = (tank: object) => (tank as Zoned).site?.timeZone ?? 'UTC'
const todayIn = (timeZone: string, now: Date) => formatLocalDate(localDateAt(timeZone, now.getTime()))
const plusDays = (day: string, days: number) => formatLocalDate(addDays(parseLocalDate(day), days))

function present(e: Equipment, task: CareTask | null, timeZone: string, now: Date): PublicEquipment {
  return {
    id: e.id,
    tankId: e.tankId,
    kind: e.kind,
    name: e.name,
    model: e.model,
    watts: e.watts ?? null,
    installedOn: e.installedOn,
    age: ageText(ageBetween(e.installedOn, todayIn(timeZone, now))),
    serviceAction: e.serviceAction,
    serviceEveryDays: e.serviceEveryDays ?? null,
    careTaskId: e.careTaskId ?? null,
    lastServicedAt: task?.lastDoneAt?.toISOString() ?? null,
    due: task?.active ? careDue(task, timeZone, now) : null,
    notes: e.notes,
    retiredAt: e.retiredAt?.toISOString() ?? null,
  }
}

/** The care task's fields for this equipment's service: due first one interval after it went in. */
function taskFields(e: Equipment) {
  const every = e.serviceEveryDays
  return {
    title: `${SERVICE_DEFAULTS[e.kind].task}: ${e.name}`,
    recurrence: { kind: 'interval' as const, everyDays: every ?? 1 },
    startsOn: plusDays(e.installedOn, every ?? 0),
    active: every !== null && every !== undefined && !e.retiredAt,
  }
}

/** "Heater installed 2 years 3 months ago" for the tank's newest working heater, or null. */
export async function heaterAge(ctx: AppContext, tankId: number, now = new Date(), transaction?: Transaction): Promise<HeaterAge | null> {
  const heater = await ctx.models.Equipment.findOne({ where: { tankId, kind: 'heater', retiredAt: null }, order: [['installedOn', 'DESC']], transaction })
  if (!heater) return null
  const tank = await ctx.models.Tank.findByPk(tankId, { include: [{ association: 'site', attributes: ['timeZone'] }], transaction })
  const age = ageBetween(heater.installedOn, todayIn(tank ? zoneOf(tank) : 'UTC', now))
  const text = age.years || age.months || age.days ? `Heater installed ${ageText(age)} ago` : 'Heater installed today'
  return { name: heater.name, installedOn: heater.installedOn, text }
}

export const equipmentService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function findVisible(actor: UserActor, id: number) {
    const equipment = await models.Equipment.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!equipment) throw notFound('Equipment not found')
    const tank = await visibleTank(ctx, actor, equipment.tankId)
    return { equipment, tank }
  }

  async function syncTask(e: Equipment, transaction: Transaction, doneAt?: { at: Date; userId: number }) {
    const fields = taskFields(e)
    if (e.careTaskId) {
      const task = await models.CareTask.findByPk(e.careTaskId, { transaction })
      if (task) {
        await task.update({ ...fields, ...(doneAt ? { lastDoneAt: doneAt.at, lastDoneBy: doneAt.userId } : {}) }, { transaction })
        return task
      }
    }
    if (!fields.active) return null
    const task = await models.CareTask.create({ organizationId: e.organizationId, tankId: e.tankId, kind: 'equipment_service', ...fields }, { transaction })
    await e.update({ careTaskId: task.id }, { transaction })
    return task
  }

  async function view(e: Equipment, tank: object, now = new Date()) {
    const task = e.careTaskId ? await models.CareTask.findByPk(e.careTaskId) : null
    return present(e, task, zoneOf(tank), now)
  }

  return {
    async list(actor: UserActor, tankId: number, now = new Date()): Promise<PublicEquipment[]> {
      const tank = await visibleTank(ctx, actor, tankId)
      const rows = await models.Equipment.findAll({
        where: { tankId: tank.id },
        order: [
          ['retiredAt', 'DESC NULLS FIRST'],
          ['kind', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const taskIds = rows.map((r) => r.careTaskId).filter((id): id is number => id != null)
      const tasks = new Map((taskIds.length ? await models.CareTask.findAll({ where: { id: taskIds } }) : []).map((t) => [t.id, t]))
      return rows.map((r) => present(r, tasks.get(r.careTaskId ?? 0) ?? null, zoneOf(tank), now))
    },

    async create(actor: UserActor, tankId: number, input: EquipmentInput): Promise<PublicEquipment> {
      const tank = await visibleTank(ctx, actor, tankId)
      if (input.installedOn > todayIn(zoneOf(tank), new Date()))
        throw badRequest('installedOn: cannot be in the future', { installedOn: 'cannot be in the future' })
      const defaults = SERVICE_DEFAULTS[input.kind]
      const equipment = await sequelize.transaction(async (transaction) => {
        const equipment = await models.Equipment.create(
          {
            ...input,
            organizationId: actor.organizationId,
            tankId: tank.id,
            serviceAction: input.serviceAction ?? defaults.action,
            serviceEveryDays: input.serviceEveryDays === undefined ? defaults.everyDays : input.serviceEveryDays,
            createdBy: actor.userId,
          },
          { transaction },
        )
        await syncTask(equipment, transaction)
        return equipment
      })
      return view(equipment, tank)
    },

    async update(actor: UserActor, id: number, changes: EquipmentUpdate): Promise<PublicEquipment> {
      const { equipment, tank } = await findVisible(actor, id)
      const { retired, ...rest } = changes
      await sequelize.transaction(async (transaction) => {
        const retiredAt = retired === undefined ? equipment.retiredAt : retired ? (equipment.retiredAt ?? new Date()) : null
        await equipment.update({ ...rest, retiredAt }, { transaction })
        await syncTask(equipment, transaction)
      })
      return view(equipment, tank)
    },

    /**
     * The tank's working equipment, one record each on another tank (a copy of the tank), with
     * its own service reminder: same kind, name, model, power, install day and interval.
     */
    async copyToTank(fromTankId: number, toTankId: number, userId: number, transaction: Transaction) {
      const rows = await models.Equipment.findAll({ where: { tankId: fromTankId, retiredAt: null }, order: [['id', 'ASC']], transaction })
      for (const e of rows) {
        const { organizationId, kind, name, model, watts, installedOn, serviceAction, serviceEveryDays, notes } = e
        const copy = await models.Equipment.create(
          { organizationId, tankId: toTankId, kind, name, model, watts, installedOn, serviceAction, serviceEveryDays, notes, createdBy: userId },
          { transaction },
        )
        await syncTask(copy, transaction)
      }
    },

    /** A new part in place of the old: the install date starts again, the care log says so, the reminder counts from now. */
    async replace(actor: UserActor, id: number, input: EquipmentReplace): Promise<PublicEquipment> {
      const { equipment, tank } = await findVisible(actor, id)
      const now = new Date()
      const today = todayIn(zoneOf(tank), now)
      const on = input.on ?? today
      if (on > today) throw badRequest('on: cannot be in the future', { on: 'cannot be in the future' })
      if (equipment.retiredAt) throw badRequest('id: this equipment is retired', { id: 'this equipment is retired' })
      await sequelize.transaction(async (transaction) => {
        const old = equipment.model
        await equipment.update(
          { installedOn: on, ...(input.model !== undefined ? { model: input.model } : {}), ...(input.watts !== undefined ? { watts: input.watts } : {}) },
          { transaction },
        )
        const what = `${EQUIPMENT_KIND_LABELS[equipment.kind]} replaced: ${equipment.name}`
        const parts =
          input.model !== undefined && input.model !== old ? ` (${old || 'old part'} → ${input.model})` : equipment.model ? ` (${equipment.model})` : ''
        await models.CareLogEntry.create(
          {
            organizationId: equipment.organizationId,
            tankId: equipment.tankId,
            kind: 'equipment',
            at: now,
            userId: actor.userId,
            text: `${what}${parts}${input.notes ? `: ${input.notes}` : ''}`,
            values: { equipmentId: equipment.id },
            careTaskId: equipment.careTaskId ?? null,
          },
          { transaction },
        )
        await syncTask(equipment, transaction, { at: now, userId: actor.userId })
      })
      return view(equipment, tank)
    },
  }
})
