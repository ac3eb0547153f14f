import { Op, type Transaction } from 'sequelize'
import { CARE_TASK_KIND_TITLES, defaultCareTasksFor, type CareTaskKind } from '@shared/care/defaults'
import { byUrgency, careDue, type CareDue } from '@shared/care/due'
import type { CareTaskDone, CareTaskInput, CareTasksDone, CareTaskUpdate } from '@shared/schemas/care'
import type { PublicCareTask } from '@shared/schemas/care-api'
import type { UserActor } from '../access/actor'
import { tanksToWatch } from './tanks-to-watch'
import { runningCourses } from './treatment-courses'
import { courseNoteFor } from '@shared/care/treatment'
import type { AppContext } from '../context'
import { badRequest, conflict, notFound } from '../platform/errors'
import type { CareLogEntry, CareTask, Tank } from '../models'
import { isRepeatedClientId, loggedBefore, phoneTime, presentCareLog, writeCareLog } from './care-log'
import { whoIsOnDuty } from '../roster'
import { siteScope, visibleTank } from '../access/scope'
import { sitesService } from '../sites'
import { checkTaskConsumable, consumableAlerts, drawDown } from '../equipment'
import type { CreatedDevice, CreatedTank } from '../platform/events'
import { phCalibrationTask } from '@shared/calibration/care'
import { perContext } from '../platform/per-context'

/** A snooze longer than this is a task that should be changed or switched off instead. */
const MAX_SNOOZE_DAYS = 60
const DAY_MS = 86_400_000

export type { PublicCareTask }
type TankWithSite = Tank & { site?: { id: number; name: string; timeZone: string } }

function presentTask(task: CareTask, timeZone: string, now: Date): PublicCareTask {
  return {
    id: task.id,
    tankId: task.tankId,
    kind: task.kind,
    title: task.title,
    recurrence: task.recurrence,
    defaultValues: task.defaultValues,
    startsOn: task.startsOn ?? null,
    endsOn: task.endsOn ?? null,
    treatmentCourseId: task.treatmentCourseId ?? null,
    lastDoneAt: task.lastDoneAt?.toISOString() ?? null,
    lastDoneBy: task.lastDoneBy ?? null,
    snoozedUntil: task.snoozedUntil && task.snoozedUntil > now ? task.snoozedUntil.toISOString() : null,
    snoozeReason: task.snoozedUntil && task.snoozedUntil > now ? task.snoozeReason : null,
    active: task.active,
    consumableId: task.consumableId ?? null,
    consumableAmount: task.consumableAmount ?? null,
    due: task.active ? careDue(task, timeZone, now) : null,
  }
}

const zoneOf = (tank: TankWithSite) => tank.site?.timeZone ?? 'UTC'

/** The starter routine for a new tank (see shared/care/defaults); call it where tanks are created. */
export async function createDefaultCareTasks(ctx: AppContext, tank: CreatedTank, transaction?: Transaction) {
  // Once per tank: a tank that already has tasks keeps them.
  const existing = await ctx.models.CareTask.findAll({ where: { tankId: tank.id }, order: [['id', 'ASC']], transaction })
  if (existing.length) return existing
  const drafts = defaultCareTasksFor({ kind: tank.kind, stage: tank.stage })
  return ctx.models.CareTask.bulkCreate(
    drafts.map((d) => ({ ...d, organizationId: tank.organizationId, tankId: tank.id })),
    { transaction },
  )
}

/** A new pH probe's care task: calibrate it every few weeks (shared/calibration/care.ts); not for one that calibrates itself. */
export async function createProbeCareTasks(ctx: AppContext, device: CreatedDevice) {
  if (!device.metrics.includes('ph') || device.selfCalibrating) return
  await ctx.models.CareTask.create({ ...phCalibrationTask(device.name), organizationId: device.organizationId, tankId: device.tankId, deviceId: device.id })
}

/** Recording a probe's calibration ticks off its care task. */
export async function markDeviceTasksDone(ctx: AppContext, deviceId: number, at: Date, userId: number | null) {
  await ctx.models.CareTask.update({ lastDoneAt: at, lastDoneBy: userId, snoozedUntil: null, snoozeReason: null }, { where: { deviceId, active: true } })
}

/** Marks every active task of `kind` on the tank done at `at` (a finished water change does this). */
export async function markTasksOfKindDone(ctx: AppContext, tankId: number, kind: CareTaskKind, at: Date, userId: number | null, transaction?: Transaction) {
  await ctx.models.CareTask.update(
    { lastDoneAt: at, lastDoneBy: userId, snoozedUntil: null, snoozeReason: null },
    { where: { tankId, kind, active: true }, transaction },
  )
}

export type CareDueCounts = { overdue: number; dueToday: number }

/**
 * Overdue and due-today counts of active, unsnoozed tasks on live tanks, per site and per tank;
 * for the wall and the site summary. No actor: the caller has already scoped the ids.
 */
export async function careDueCounts(ctx: AppContext, where: { siteIds?: number[]; tankIds?: number[] }, now = new Date()) {
  const bySite = new Map<number, CareDueCounts>()
  const byTank = new Map<number, CareDueCounts>()
  const items = await dueItems(ctx, where, now)
  for (const { tank, due } of items) {
    if (due.snoozed || (due.status !== 'overdue' && due.status !== 'due_today')) continue
    for (const [map, key] of [
      [bySite, tank.siteId],
      [byTank, tank.id],
    ] as const) {
      const counts = map.get(key) ?? { overdue: 0, dueToday: 0 }
      if (due.status === 'overdue') counts.overdue++
      else counts.dueToday++
      map.set(key, counts)
    }
  }
  return { bySite, byTank }
}

/** Every active task on the live tanks named, with its due state at `now`; no actor, the caller scopes the ids. */
export async function dueItems(ctx: AppContext, where: { siteIds?: number[]; tankIds?: number[] }, now: Date) {
  if ((where.siteIds && !where.siteIds.length) || (where.tankIds && !where.tankIds.length)) return []
  const tanks = (await ctx.models.Tank.findAll({
    where: {
      archivedAt: null,
      stage: { [Op.ne]: 'empty' },
      ...(where.siteIds ? { siteId: where.siteIds } : {}),
      ...(where.tankIds ? { id: where.tankIds } : {}),
    },
    include: [{ association: 'site', attributes: ['id', 'name', 'timeZone'] }],
  })) as TankWithSite[]
  if (!tanks.length) return []
  const byId = new Map(tanks.map((t) => [t.id, t]))
  const tasks = await ctx.models.CareTask.findAll({ where: { tankId: tanks.map((t) => t.id), active: true }, order: [['id', 'ASC']] })
  return tasks
    .map((task) => {
      const tank = byId.get(task.tankId) as TankWithSite
      return { task, tank, due: careDue(task, zoneOf(tank), now) as CareDue }
    })
    .filter(({ task, due }) => !task.endsOn || (due.today <= task.endsOn && due.dueOn <= task.endsOn))
}

export const careTasksService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function findTask(actor: UserActor, id: number) {
    const task = await models.CareTask.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!task) throw notFound('Care task not found')
    const tank = (await visibleTank(ctx, actor, task.tankId)) as TankWithSite
    return { task, tank }
  }

  /** Tasks due today or overdue at the given sites, overdue first. */
  async function todayAt(siteIds: number[], now: Date) {
    const items = (await dueItems(ctx, { siteIds }, now)).filter((i) => !i.due.snoozed && (i.due.status === 'overdue' || i.due.status === 'due_today'))
    items.sort((a, b) => byUrgency(a.due, b.due) || a.tank.name.localeCompare(b.tank.name) || a.task.id - b.task.id)
    const tanks = [...new Map(items.map(({ tank }) => [tank.id, { id: tank.id, timeZone: zoneOf(tank) }])).values()]
    const courses = await runningCourses(ctx, tanks, now)
    return items.map(({ task, tank }) => ({
      ...presentTask(task, zoneOf(tank), now),
      tank: { id: tank.id, name: tank.name },
      site: { id: tank.siteId, name: tank.site?.name ?? '', timeZone: zoneOf(tank) },
      courseNote: task.treatmentCourseId ? null : courseNoteFor(task, courses.get(tank.id) ?? []),
    }))
  }

  /** A tick made while offline must not log a round someone else has ticked off since the ticker looked. */
  async function refuseIfDoneSince(task: CareTask, seenLastDoneAt: string | null) {
    const seen = seenLastDoneAt ? new Date(seenLastDoneAt) : null
    if (!task.lastDoneAt || (seen && task.lastDoneAt <= seen)) return
    const doer = task.lastDoneBy == null ? null : await models.User.findByPk(task.lastDoneBy, { attributes: ['name'] })
    throw conflict('already_done', `Already done by ${doer?.name ?? 'someone else'} since you looked`)
  }

  async function isOnDutyAt(actor: UserActor, siteId: number, now: Date) {
    const { onDuty } = await whoIsOnDuty(ctx, siteId, now)
    return onDuty.some((p) => p.userId === actor.userId)
  }

  return {
    async listForTank(actor: UserActor, tankId: number, now = new Date()) {
      const tank = (await visibleTank(ctx, actor, tankId)) as TankWithSite
      const tasks = await models.CareTask.findAll({ where: { tankId: tank.id }, order: [['id', 'ASC']] })
      return tasks.map((t) => presentTask(t, zoneOf(tank), now))
    },

    async create(actor: UserActor, tankId: number, input: CareTaskInput) {
      const tank = (await visibleTank(ctx, actor, tankId)) as TankWithSite
      await checkTaskConsumable(ctx, tank.siteId, input.consumableId, input.consumableAmount)
      const task = await models.CareTask.create({
        ...input,
        title: input.title ?? CARE_TASK_KIND_TITLES[input.kind],
        organizationId: actor.organizationId,
        tankId: tank.id,
        createdBy: actor.userId,
      })
      return presentTask(task, zoneOf(tank), new Date())
    },

    async update(actor: UserActor, id: number, changes: CareTaskUpdate) {
      const { task, tank } = await findTask(actor, id)
      await checkTaskConsumable(ctx, tank.siteId, changes.consumableId ?? task.consumableId, changes.consumableAmount ?? task.consumableAmount)
      await task.update(changes)
      return presentTask(task, zoneOf(tank), new Date())
    },

    async markDone(actor: UserActor, id: number, input: CareTaskDone) {
      const { task, tank } = await findTask(actor, id)
      const expect = { tankId: tank.id, careTaskId: task.id }
      const answer = async (entry: CareLogEntry) => ({ task: presentTask(task, zoneOf(tank), new Date()), logEntry: (await presentCareLog(ctx, [entry]))[0] })
      const earlier = await loggedBefore(ctx, actor.organizationId, input.clientId, expect)
      if (earlier) return answer(earlier)
      if (!task.active) throw badRequest('id: this task is switched off', { id: 'this task is switched off' })
      const at = phoneTime(input.at, 'at', ctx.config.readingLimits)
      if (input.seenLastDoneAt !== undefined) await refuseIfDoneSince(task, input.seenLastDoneAt)
      const entry = await sequelize
        .transaction(async (transaction) => {
          // A late write-up of an older round never moves "last done" backwards.
          if (!task.lastDoneAt || task.lastDoneAt < at) {
            await task.update({ lastDoneAt: at, lastDoneBy: actor.userId, snoozedUntil: null, snoozeReason: null }, { transaction })
          }
          await drawDown(ctx, task, transaction)
          return writeCareLog(
            ctx,
            {
              organizationId: actor.organizationId,
              tankId: tank.id,
              kind: 'task_done',
              at,
              userId: actor.userId,
              text: input.notes ? `${task.title}: ${input.notes}` : task.title,
              values: { taskKind: task.kind, ...task.defaultValues, ...input.values },
              careTaskId: task.id,
              clientId: input.clientId ?? null,
            },
            transaction,
          )
        })
        .catch(async (error: unknown) => {
          const other = isRepeatedClientId(error, input.clientId) ? await loggedBefore(ctx, actor.organizationId, input.clientId, expect) : null
          if (!other) throw error
          await task.reload()
          return other
        })
      return answer(entry)
    },

    /**
     * Several tasks done now, in one transaction: an unknown or switched-off task refuses the lot.
     * Rows are locked in id order, so two people ticking overlapping sets wait for each other, and
     * a task ticked since the caller saw it comes back `already_done` with who and when, unlogged.
     */
    async markManyDone(actor: UserActor, input: CareTasksDone) {
      const at = new Date()
      const ids = input.tasks.map((t) => t.id)
      const done = await sequelize.transaction(async (transaction) => {
        const rows = await models.CareTask.findAll({
          where: { id: ids, organizationId: actor.organizationId },
          order: [['id', 'ASC']],
          lock: transaction.LOCK.UPDATE,
          transaction,
        })
        const byId = new Map(rows.map((r) => [r.id, r]))
        const outcomes: Array<{ task: CareTask; tank: TankWithSite; outcome: 'done' | 'already_done' }> = []
        for (const [index, seen] of input.tasks.entries()) {
          const task = byId.get(seen.id)
          if (!task) throw notFound(`Care task ${seen.id} not found`)
          const tank = (await visibleTank(ctx, actor, task.tankId)) as TankWithSite
          if (!task.active) throw badRequest(`tasks.${index}.id: this task is switched off`, { [`tasks.${index}.id`]: 'this task is switched off' })
          const seenAt = seen.seenLastDoneAt ? new Date(seen.seenLastDoneAt) : null
          if (task.lastDoneAt && (!seenAt || task.lastDoneAt > seenAt)) {
            outcomes.push({ task, tank, outcome: 'already_done' })
            continue
          }
          await task.update({ lastDoneAt: at, lastDoneBy: actor.userId, snoozedUntil: null, snoozeReason: null }, { transaction })
          await drawDown(ctx, task, transaction)
          await writeCareLog(
            ctx,
            {
              organizationId: actor.organizationId,
              tankId: tank.id,
              kind: 'task_done',
              at,
              userId: actor.userId,
              text: input.notes ? `${task.title}: ${input.notes}` : task.title,
              values: { taskKind: task.kind, ...task.defaultValues },
              careTaskId: task.id,
            },
            transaction,
          )
          outcomes.push({ task, tank, outcome: 'done' })
        }
        return outcomes
      })
      const doerIds = [...new Set(done.map((d) => d.task.lastDoneBy).filter((id): id is number => id != null))]
      const doers = doerIds.length ? await models.User.findAll({ attributes: ['id', 'name'], where: { id: doerIds } }) : []
      const names = new Map(doers.map((u) => [u.id, u.name]))
      return {
        results: done.map(({ task, tank, outcome }) => ({
          id: task.id,
          outcome,
          doneAt: task.lastDoneAt?.toISOString() ?? null,
          doneBy: task.lastDoneBy == null ? null : { id: task.lastDoneBy, name: names.get(task.lastDoneBy) ?? 'former user' },
          task: presentTask(task, zoneOf(tank), new Date()),
        })),
      }
    },

    async snooze(actor: UserActor, id: number, input: { until: string; reason: string }) {
      const { task, tank } = await findTask(actor, id)
      const until = new Date(input.until)
      const now = Date.now()
      if (until.getTime() <= now) throw badRequest('until: must be in the future', { until: 'must be in the future' })
      if (until.getTime() > now + MAX_SNOOZE_DAYS * DAY_MS) {
        throw badRequest(`until: at most ${MAX_SNOOZE_DAYS} days ahead; change the task instead`, { until: `at most ${MAX_SNOOZE_DAYS} days ahead` })
      }
      await task.update({ snoozedUntil: until, snoozeReason: input.reason })
      return presentTask(task, zoneOf(tank), new Date())
    },

    /**
     * One site's list, or (mine) the sites where the caller is on the duty roster right now. Someone
     * on duty nowhere gets every site they may see (`onDuty: false`): an empty "mine" would read as
     * "nothing due" while tasks are waiting.
     */
    async today(actor: UserActor, query: { siteId?: number; mine: boolean }, now = new Date()) {
      if (query.siteId !== undefined) {
        await sitesService(ctx).find(actor, query.siteId)
        const siteIds = [query.siteId]
        return {
          siteIds,
          onDuty: await isOnDutyAt(actor, query.siteId, now),
          tasks: await todayAt(siteIds, now),
          watch: await tanksToWatch(ctx, siteIds, now),
          stock: await consumableAlerts(ctx, siteIds, now),
        }
      }
      const sites = await models.Site.findAll({ attributes: ['id'], where: { ...siteScope(actor, 'id'), archivedAt: null }, order: [['id', 'ASC']] })
      const mine: number[] = []
      for (const site of sites) if (await isOnDutyAt(actor, site.id, now)) mine.push(site.id)
      const siteIds = mine.length ? mine : sites.map((s) => s.id)
      return {
        siteIds,
        onDuty: mine.length > 0,
        tasks: await todayAt(siteIds, now),
        watch: await tanksToWatch(ctx, siteIds, now),
        stock: await consumableAlerts(ctx, siteIds, now),
      }
    },

    async siteSummary(actor: UserActor, siteId: number, now = new Date()): Promise<CareDueCounts> {
      await sitesService(ctx).find(actor, siteId)
      const { bySite } = await careDueCounts(ctx, { siteIds: [siteId] }, now)
      return bySite.get(siteId) ?? { overdue: 0, dueToday: 0 }
    },
  }
})
