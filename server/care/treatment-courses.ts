import { Op, type Transaction } from 'sequelize'
import type { TankShape } from '@shared/chemistry/volume'
import { COURSE_CAUTIONS, courseEndsOn, courseState, courseTaskDrafts, doseForTank, doseWaterLitres } from '@shared/care/treatment'
import type { PublicTreatmentCourse, RunningCourse, TreatmentCourseInput } from '@shared/schemas/treatment'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import { visibleTank } from '../access/scope'
import type { AppContext } from '../context'
import type { Tank } from '../models'
import type { TreatmentCourse } from './treatment-model'
import { badRequest, conflict, notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import { writeCareLog } from './care-log'

type TankWithSite = Tank & { site?: { timeZone: string } }

const tankWaterLitres = (tank: Tank) =>
  doseWaterLitres({ dimensions: tank.dimensions as TankShape | null, substrateDepthCm: tank.substrateDepthCm, volumeLitres: tank.volumeLitres })

const todayAt = (timeZone: string, now: Date) => formatLocalDate(localDateAt(timeZone, now.getTime()))

/** Courses on these tanks that run on each tank's `today`; no actor, the caller scopes the ids. */
export async function runningCourses(ctx: AppContext, tanks: Array<{ id: number; timeZone: string }>, now = new Date()): Promise<Map<number, RunningCourse[]>> {
  const byTank = new Map<number, RunningCourse[]>()
  if (!tanks.length) return byTank
  const earliest = new Date(now.getTime() - 2 * 86_400_000)
  const rows = await ctx.models.TreatmentCourse.findAll({
    where: { tankId: tanks.map((t) => t.id), stoppedAt: null, endsOn: { [Op.gte]: formatLocalDate(localDateAt('UTC', earliest.getTime())) } },
    order: [['id', 'ASC']],
  })
  const zones = new Map(tanks.map((t) => [t.id, t.timeZone]))
  for (const row of rows) {
    const today = todayAt(zones.get(row.tankId) ?? 'UTC', now)
    if (courseState({ startsOn: row.startsOn, endsOn: row.endsOn, stoppedAt: null }, today).state !== 'running') continue
    byTank.set(row.tankId, [...(byTank.get(row.tankId) ?? []), { id: row.id, product: row.product, endsOn: row.endsOn }])
  }
  return byTank
}

export const treatmentCoursesService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function present(course: TreatmentCourse, tank: TankWithSite, now: Date, taskIds?: number[]): Promise<PublicTreatmentCourse> {
    const today = todayAt(tank.site?.timeZone ?? 'UTC', now)
    const waterLitres = tankWaterLitres(tank)
    const ids =
      taskIds ?? (await models.CareTask.findAll({ attributes: ['id'], where: { treatmentCourseId: course.id }, order: [['id', 'ASC']] })).map((t) => t.id)
    const author = course.createdBy ? await models.User.findByPk(course.createdBy, { attributes: ['id', 'name'] }) : null
    return {
      id: course.id,
      tankId: course.tankId,
      product: course.product,
      dose: course.dose,
      tankDose: { amount: doseForTank(course.dose, waterLitres), unit: course.dose.unit, waterLitres },
      days: course.days,
      doseEveryDays: course.doseEveryDays,
      startsOn: course.startsOn,
      endsOn: course.endsOn,
      tests: course.tests,
      notes: course.notes,
      ...courseState({ startsOn: course.startsOn, endsOn: course.endsOn, stoppedAt: course.stoppedAt?.toISOString() ?? null }, today),
      stoppedAt: course.stoppedAt?.toISOString() ?? null,
      createdBy: author ? { id: author.id, name: author.name } : null,
      createdAt: course.createdAt.toISOString(),
      careTaskIds: ids,
      cautions: COURSE_CAUTIONS,
    }
  }

  async function tankOf(actor: UserActor, tankId: number) {
    const tank = (await visibleTank(ctx, actor, tankId)) as TankWithSite
    const site = await models.Site.findByPk(tank.siteId, { attributes: ['timeZone'] })
    return Object.assign(tank, { site: { timeZone: site?.timeZone ?? 'UTC' } }) as TankWithSite
  }

  async function writeLog(actor: UserActor, tankId: number, text: string, courseId: number, transaction: Transaction) {
    await writeCareLog(
      ctx,
      { organizationId: actor.organizationId, tankId, kind: 'dosing', at: new Date(), userId: actor.userId, text, values: { courseId } },
      transaction,
    )
  }

  return {
    async list(actor: UserActor, tankId: number, now = new Date()) {
      const tank = await tankOf(actor, tankId)
      const courses = await models.TreatmentCourse.findAll({
        where: { tankId: tank.id },
        order: [
          ['startsOn', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: 100,
      })
      return Promise.all(courses.map((c) => present(c, tank, now)))
    },

    /** A course and its tasks in one transaction: a dose task on its dose days and a task per test and time of day, each ending with the course. */
    async start(actor: UserActor, tankId: number, input: TreatmentCourseInput, now = new Date()) {
      const tank = await tankOf(actor, tankId)
      if (tank.stage === 'empty') throw badRequest('tankId: an empty tank has nothing to treat', { tankId: 'the tank is empty' })
      const today = todayAt(tank.site?.timeZone ?? 'UTC', now)
      const startsOn = input.startsOn ?? today
      if (startsOn < today) throw badRequest('startsOn: cannot start in the past', { startsOn: 'today or later' })
      const endsOn = courseEndsOn(startsOn, input.days)
      const running = await runningCourses(ctx, [{ id: tank.id, timeZone: tank.site?.timeZone ?? 'UTC' }], now)
      const overlapping = (running.get(tank.id) ?? []).find((c) => c.endsOn >= startsOn)
      if (overlapping) {
        throw conflict('course_running', `${overlapping.product} is still running on this tank until ${overlapping.endsOn}: stop it first or start after it`, {
          startsOn: `after ${overlapping.endsOn}`,
        })
      }
      const drafts = courseTaskDrafts({ ...input, waterLitres: tankWaterLitres(tank) })
      const { course, taskIds } = await sequelize.transaction(async (transaction) => {
        const course = await models.TreatmentCourse.create(
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            product: input.product,
            dose: input.dose,
            days: input.days,
            doseEveryDays: input.doseEveryDays,
            startsOn,
            endsOn,
            tests: input.tests,
            notes: input.notes,
            createdBy: actor.userId,
          },
          { transaction },
        )
        const tasks = await models.CareTask.bulkCreate(
          drafts.map(({ role: _role, ...d }) => ({
            ...d,
            organizationId: actor.organizationId,
            tankId: tank.id,
            startsOn,
            endsOn,
            treatmentCourseId: course.id,
            createdBy: actor.userId,
          })),
          { transaction },
        )
        await writeLog(actor, tank.id, `Treatment course started: ${input.product}, ${input.days} days from ${startsOn}`, course.id, transaction)
        return { course, taskIds: tasks.map((t) => t.id) }
      })
      return present(course, tank, now, taskIds)
    },

    /** Ends a course early: its tasks are switched off, the course and the care log say when and who. */
    async stop(actor: UserActor, id: number, now = new Date()) {
      const course = await models.TreatmentCourse.findOne({ where: { id, organizationId: actor.organizationId } })
      if (!course) throw notFound('Treatment course not found')
      const tank = await tankOf(actor, course.tankId)
      if (course.stoppedAt) throw conflict('course_stopped', 'This course was already stopped')
      await sequelize.transaction(async (transaction) => {
        await course.update({ stoppedAt: now, stoppedBy: actor.userId }, { transaction })
        await models.CareTask.update({ active: false }, { where: { treatmentCourseId: course.id }, transaction })
        await writeLog(actor, tank.id, `Treatment course stopped: ${course.product}`, course.id, transaction)
      })
      return present(course, tank, now)
    },
  }
})
