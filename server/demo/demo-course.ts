// The demo's quarantine tank on day 4 of an invented copper course: dosed and tested on each
// of the first three days, today's dose and tests waiting in Care today. Invented data.
import { treatmentCourseInputSchema } from '@shared/schemas/treatment'
import { addDays, formatLocalDate, localDateAt, localToInstant } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { treatmentCoursesService, writeCareLog } from '../care'

export const DEMO_COURSE_TANK = 'Quarantine Q1'
/** Day of the course the demo stands on. */
export const DEMO_COURSE_DAY = 4

const COURSE = treatmentCourseInputSchema.parse({
  product: 'Chelated copper treatment (invented demo label)',
  dose: { amount: 1.5, unit: 'mL', perLitres: 20 },
  days: 14,
  tests: [{ metric: 'copper', timesPerDay: 2, band: { min: 0.15, max: 0.25 } }],
  notes: 'Arrivals showed white spots; carbon taken out of the sponge filter for the course.',
})

/** Local minutes each course task is done: the dose in the morning, copper tested morning and evening. */
const DONE_AT: Array<{ match: RegExp; minutes: number; copper?: number[] }> = [
  { match: /^Dose /, minutes: 9 * 60 },
  { match: /\(morning\)/, minutes: 9 * 60 + 45, copper: [0.12, 0.17, 0.19] },
  { match: /\(evening\)/, minutes: 18 * 60, copper: [0.15, 0.18, 0.2] },
]

export async function seedDemoCourse(ctx: AppContext, options: { actor: UserActor; now?: Date }) {
  const now = options.now ?? new Date()
  const tank = await ctx.models.Tank.findOne({ where: { name: DEMO_COURSE_TANK, organizationId: options.actor.organizationId } })
  if (!tank) return null
  const site = await ctx.models.Site.findByPk(tank.siteId)
  const zone = site?.timeZone ?? 'UTC'
  const course = await treatmentCoursesService(ctx).start(options.actor, tank.id, COURSE, now)
  // Moved back to its first day, as if started then: the course, its tasks and the start in the log.
  const today = localDateAt(zone, now.getTime())
  const firstDay = addDays(today, 1 - DEMO_COURSE_DAY)
  const startedAt = new Date(localToInstant(zone, firstDay, 8 * 60 + 30))
  await ctx.sequelize.query(`UPDATE treatment_courses SET starts_on = starts_on - $2::int, ends_on = ends_on - $2::int, created_at = $3 WHERE id = $1`, {
    bind: [course.id, DEMO_COURSE_DAY - 1, startedAt],
  })
  await ctx.sequelize.query(
    `UPDATE care_tasks SET starts_on = starts_on - $2::int, ends_on = ends_on - $2::int, created_at = $3 WHERE treatment_course_id = $1`,
    {
      bind: [course.id, DEMO_COURSE_DAY - 1, startedAt],
    },
  )
  await ctx.sequelize.query(`UPDATE care_log SET at = $2 WHERE tank_id = $1 AND kind = 'dosing' AND text LIKE 'Treatment course started:%'`, {
    bind: [tank.id, startedAt],
  })
  const tasks = await ctx.models.CareTask.findAll({ where: { treatmentCourseId: course.id }, order: [['id', 'ASC']] })
  for (const task of tasks) {
    const plan = DONE_AT.find((d) => d.match.test(task.title))
    if (!plan) continue
    let last: Date | null = null
    for (let day = 0; day < DEMO_COURSE_DAY - 1; day++) {
      const at = new Date(localToInstant(zone, addDays(firstDay, day), plan.minutes))
      const values = { taskKind: task.kind, ...task.defaultValues, ...(plan.copper ? { copper: plan.copper[day]! } : {}) }
      await writeCareLog(ctx, {
        organizationId: tank.organizationId,
        tankId: tank.id,
        kind: 'task_done',
        at,
        userId: options.actor.userId,
        text: task.title,
        values,
        careTaskId: task.id,
      })
      last = at
    }
    await task.update({ lastDoneAt: last, lastDoneBy: options.actor.userId })
  }
  return { courseId: course.id, startsOn: formatLocalDate(firstDay) }
}
