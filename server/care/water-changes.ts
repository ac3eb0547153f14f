import { waterVolumeLitres, type TankShape } from '@shared/chemistry/volume'
import { doseForVolume, HEATER_OFF_CAUTION, planWaterChange, temperatureMismatchAdvice, UNPLUG_CAUTION } from '@shared/chemistry/water-change'
import type { WaterChangeCancelInput, WaterChangeFinishInput, WaterChangePlanInput, WaterChangeStartInput } from '@shared/schemas/care'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, conflict, notFound } from '../platform/errors'
import type { Tank, WaterChange } from '../models'
import { presentCareLog, writeCareLog } from './care-log'
import { latestReading, tankTemperature } from './care-readings'
import { markTasksOfKindDone } from './care-tasks'
import { runningCourses } from './treatment-courses'
import { doseForTank, fractionLeftAfterWaterChange } from '@shared/care/treatment'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

/** common practice: a change above a quarter of the water is done with the heater off. */
export const HEATER_CONFIRM_PERCENT = 25
/** common practice: with no level reading, a tank is taken to be filled to 90 % of its height. */
export const ASSUMED_FILL_FRACTION = 0.9
export const LABEL_CAUTION = 'Follow the product label for dechlorinator and other additives; the dose shown only scales the label rate'
export const SAFETY_CAUTIONS = [HEATER_OFF_CAUTION, UNPLUG_CAUTION, LABEL_CAUTION]
export const TEMPORARY_RULE_NAME = 'Water change in progress: level at or below the heater top'
const LEVEL_READING_MAX_AGE_MS = 24 * 3600_000

async function fillHeightOf(ctx: AppContext, tank: Tank, shape: TankShape) {
  const reading = await latestReading(ctx, tank.id, 'water_level', LEVEL_READING_MAX_AGE_MS)
  if (reading && reading.value > tank.substrateDepthCm && reading.value <= shape.heightCm) {
    return { cm: reading.value, source: 'reading' as const, readingAt: new Date(reading.time).toISOString(), note: 'From the latest water-level reading' }
  }
  return {
    cm: shape.heightCm * ASSUMED_FILL_FRACTION,
    source: 'assumed' as const,
    readingAt: null,
    note: 'No usable water-level reading in the last 24 h: assumed filled to 90 % of the tank height',
  }
}

/** The chemistry functions refuse impossible input with a RangeError naming the field first. */
function asBadRequest<T>(compute: () => T): T {
  try {
    return compute()
  } catch (error) {
    if (!(error instanceof RangeError)) throw error
    const field = /^[\w.]+/.exec(error.message)?.[0] ?? 'percent'
    throw badRequest(`${field}: ${error.message}`, { [field]: error.message })
  }
}

function present(change: WaterChange) {
  return {
    id: change.id,
    tankId: change.tankId,
    status: change.status,
    plan: change.plan,
    heaterOffConfirmed: change.heaterOffConfirmed,
    temporaryRuleId: change.temporaryRuleId ?? null,
    startedAt: change.startedAt.toISOString(),
    startedBy: change.startedBy,
    finishedAt: change.finishedAt?.toISOString() ?? null,
    finishedBy: change.finishedBy ?? null,
    litresReplaced: change.litresReplaced ?? null,
    dechlorinatorMl: change.dechlorinatorMl ?? null,
    newWaterTempC: change.newWaterTempC ?? null,
    careLogEntryId: change.careLogEntryId ?? null,
    cancelledAt: change.cancelledAt?.toISOString() ?? null,
    cancelledBy: change.cancelledBy ?? null,
    cancelReason: change.cancelReason ?? null,
  }
}

/** Said on the tank page and in the log when a change is called off with the heater possibly still off. */
export const CANCEL_CAUTION = 'Top the tank back up to its usual level before switching the heater on again'

export const waterChangesService = perContext((ctx: AppContext) => {
  const { models, sequelize, events } = ctx

  async function planFor(tank: Tank, input: WaterChangePlanInput) {
    const shape = tank.dimensions as TankShape | null
    if (!shape) {
      throw badRequest('dimensions: enter the tank’s inside dimensions to plan a water change', { dimensions: 'the tank has no dimensions' })
    }
    const fillHeight = await fillHeightOf(ctx, tank, shape)
    const heaterTopCm = tank.heater?.topCm
    const amount = input.percent !== undefined ? { percent: input.percent } : { litres: input.litres as number }
    const plan = asBadRequest(() => planWaterChange({ shape, fillHeightCm: fillHeight.cm, substrateDepthCm: tank.substrateDepthCm, heaterTopCm, ...amount }))
    const waterLitres = waterVolumeLitres(shape, fillHeight.cm, tank.substrateDepthCm)
    const dose = input.labelRate
      ? { ...asBadRequest(() => doseForVolume(plan.litresOut, input.labelRate!)), forLitres: plan.litresOut, labelRate: input.labelRate }
      : null
    const tankTemp = input.newWaterTempC !== undefined ? await tankTemperature(ctx, tank) : null
    const temperature = tankTemp
      ? {
          tankC: tankTemp.value,
          tankSource: tankTemp.source,
          newWaterC: input.newWaterTempC as number,
          ...temperatureMismatchAdvice(tankTemp.value, input.newWaterTempC as number),
        }
      : null
    const requiresHeaterOffConfirmation = plan.heaterExposed || plan.percent > HEATER_CONFIRM_PERCENT
    const treatment = await treatmentFor(tank, waterLitres, plan.litresOut)
    return {
      tankId: tank.id,
      waterLitres,
      fillHeight,
      heaterTopCm: heaterTopCm ?? null,
      ...plan,
      requiresHeaterOffConfirmation,
      heaterConfirmAbovePercent: HEATER_CONFIRM_PERCENT,
      dose,
      temperature,
      treatment,
      cautions: [...new Set([...plan.cautions, ...SAFETY_CAUTIONS])],
    }
  }

  /** A course running on the tank: a change takes its share of the medication out with the water. */
  async function treatmentFor(tank: Tank, waterLitres: number, litresOut: number) {
    const site = await models.Site.findByPk(tank.siteId, { attributes: ['timeZone'] })
    const [running] = (await runningCourses(ctx, [{ id: tank.id, timeZone: site?.timeZone ?? 'UTC' }])).get(tank.id) ?? []
    if (!running) return null
    const course = await models.TreatmentCourse.findByPk(running.id)
    if (!course) return null
    const percentLeft = 100 * fractionLeftAfterWaterChange(waterLitres, litresOut)
    const doseForNewWater = { amount: doseForTank(course.dose, litresOut), unit: course.dose.unit, litres: litresOut }
    return {
      courseId: course.id,
      product: course.product,
      endsOn: course.endsOn,
      percentLeft,
      doseForNewWater,
      note:
        `${course.product} is running until ${course.endsOn}: this change leaves ${percentLeft.toFixed(0)} % of it in the water. ` +
        `The label rate for the ${litresOut.toFixed(1)} L of new water is ${doseForNewWater.amount.toFixed(2)} ${course.dose.unit}; follow the label on whether to dose it.`,
    }
  }

  async function findChange(actor: UserActor, id: number) {
    const change = await models.WaterChange.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!change) throw notFound('Water change not found')
    const tank = await visibleTank(ctx, actor, change.tankId)
    return { change, tank }
  }

  return {
    async plan(actor: UserActor, tankId: number, input: WaterChangePlanInput) {
      return planFor(await visibleTank(ctx, actor, tankId), input)
    },

    async list(actor: UserActor, tankId: number) {
      const tank = await visibleTank(ctx, actor, tankId)
      const changes = await models.WaterChange.findAll({ where: { tankId: tank.id }, order: [['startedAt', 'DESC']], limit: 100 })
      return changes.map(present)
    },

    async start(actor: UserActor, tankId: number, input: WaterChangeStartInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const plan = await planFor(tank, input)
      if (plan.requiresHeaterOffConfirmation && !input.heaterOffConfirmed) {
        const why = plan.heaterExposed ? 'this change uncovers the heater' : `this change is over ${HEATER_CONFIRM_PERCENT} %`
        const message = `Confirm the heater is off (${why}). ${HEATER_OFF_CAUTION}. ${UNPLUG_CAUTION}`
        throw badRequest(`heaterOffConfirmed: ${message}`, { heaterOffConfirmed: message })
      }
      const open = await models.WaterChange.findOne({ where: { tankId: tank.id, status: 'in_progress' } })
      if (open) throw conflict('water_change_in_progress', 'A water change is already in progress on this tank; finish it first', { id: String(open.id) })
      const change = await sequelize.transaction(async (transaction) => {
        let ruleId: number | null = null
        if (tank.heater) {
          const spec = { kind: 'heater_line' as const, marginCm: 0, holdMinutes: 0, clearMargin: 0.5 }
          const existing = await models.WatchRule.findOne({ where: { tankId: tank.id, name: TEMPORARY_RULE_NAME }, transaction })
          const rule = existing
            ? await existing.update({ enabled: true, severity: 'alarm', spec }, { transaction })
            : await models.WatchRule.create(
                {
                  organizationId: tank.organizationId,
                  siteId: tank.siteId,
                  tankId: tank.id,
                  name: TEMPORARY_RULE_NAME,
                  severity: 'alarm',
                  spec,
                  createdBy: actor.userId,
                },
                { transaction },
              )
          ruleId = rule.id
        }
        return models.WaterChange.create(
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            status: 'in_progress',
            plan,
            heaterOffConfirmed: input.heaterOffConfirmed,
            temporaryRuleId: ruleId,
            startedAt: new Date(),
            startedBy: actor.userId,
          },
          { transaction },
        )
      })
      if (change.temporaryRuleId) events.emit('rules.changed', { tankIds: [tank.id] })
      return { ...present(change), cautions: plan.cautions }
    },

    async finish(actor: UserActor, id: number, input: WaterChangeFinishInput) {
      const { change, tank } = await findChange(actor, id)
      if (change.status !== 'in_progress')
        throw conflict('water_change_finished', `This water change is already ${change.status === 'cancelled' ? 'cancelled' : 'finished'}`)
      if (input.litresReplaced > tank.volumeLitres) {
        const message = `at most the tank’s ${tank.volumeLitres} L`
        throw badRequest(`litresReplaced: ${message}`, { litresReplaced: message })
      }
      const waterLitres = Number(change.plan.waterLitres) || tank.volumeLitres
      const now = new Date()
      const temporaryRuleId = change.temporaryRuleId ?? null
      const entry = await sequelize.transaction(async (transaction) => {
        const values: Record<string, number> = { litres: input.litresReplaced, percent: Math.round((1000 * input.litresReplaced) / waterLitres) / 10 }
        if (input.dechlorinatorMl !== undefined) values.dechlorinatorMl = input.dechlorinatorMl
        if (input.newWaterTempC !== undefined) values.newWaterTempC = input.newWaterTempC
        const entry = await writeCareLog(
          ctx,
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            kind: 'water_change',
            at: now,
            userId: actor.userId,
            text: input.notes || 'Water change',
            values,
            waterChangeId: change.id,
          },
          transaction,
        )
        await change.update(
          {
            status: 'finished',
            finishedAt: now,
            finishedBy: actor.userId,
            litresReplaced: input.litresReplaced,
            dechlorinatorMl: input.dechlorinatorMl ?? null,
            newWaterTempC: input.newWaterTempC ?? null,
            careLogEntryId: entry.id,
            temporaryRuleId: null,
          },
          { transaction },
        )
        await markTasksOfKindDone(ctx, tank.id, 'water_change', now, actor.userId, transaction)
        if (temporaryRuleId) await models.WatchRule.destroy({ where: { id: temporaryRuleId }, transaction })
        return entry
      })
      events.emit('rules.changed', { tankIds: [tank.id] })
      return {
        ...present(change),
        logEntry: (await presentCareLog(ctx, [entry]))[0],
        cautions: [HEATER_OFF_CAUTION, UNPLUG_CAUTION],
      }
    },

    /**
     * Calls off a started change: the temporary heater-line rule goes, a care-log note says so,
     * and the water-change task is not marked done (nothing was replaced).
     */
    async cancel(actor: UserActor, id: number, input: WaterChangeCancelInput) {
      const { change, tank } = await findChange(actor, id)
      if (change.status !== 'in_progress')
        throw conflict('water_change_finished', `This water change is already ${change.status === 'cancelled' ? 'cancelled' : 'finished'}`)
      const now = new Date()
      const temporaryRuleId = change.temporaryRuleId ?? null
      const entry = await sequelize.transaction(async (transaction) => {
        const entry = await writeCareLog(
          ctx,
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            kind: 'note',
            at: now,
            userId: actor.userId,
            text: input.reason ? `Water change cancelled (not done): ${input.reason}` : 'Water change cancelled (not done)',
            values: { waterChangeCancelled: true, plannedLitres: Number(change.plan.litresOut) || 0 },
            waterChangeId: change.id,
          },
          transaction,
        )
        await change.update(
          {
            status: 'cancelled',
            cancelledAt: now,
            cancelledBy: actor.userId,
            cancelReason: input.reason || null,
            careLogEntryId: entry.id,
            temporaryRuleId: null,
          },
          { transaction },
        )
        if (temporaryRuleId) await models.WatchRule.destroy({ where: { id: temporaryRuleId }, transaction })
        return entry
      })
      if (temporaryRuleId) events.emit('rules.changed', { tankIds: [tank.id] })
      return {
        ...present(change),
        logEntry: (await presentCareLog(ctx, [entry]))[0],
        cautions: [CANCEL_CAUTION, UNPLUG_CAUTION],
      }
    },
  }
})
