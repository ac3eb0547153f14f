import { Op } from 'sequelize'
import { occurrencesBetween } from '@shared/rules/maintenance'
import { minutesOfClock } from '@shared/time/zoned'
import type { MaintenanceInput, PublicMaintenanceWindow } from '@shared/schemas/maintenance'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { MaintenanceWindow } from '../models'
import { sitesService } from '../sites'
import { perContext } from '../platform/per-context'

const clockOf = (minute: number) => `${String(Math.floor(minute / 60)).padStart(2, '0')}:${String(minute % 60).padStart(2, '0')}`

function present(w: MaintenanceWindow, timeZone: string, from: number, to: number): PublicMaintenanceWindow {
  const span = {
    startsAt: w.startsAt?.getTime(),
    endsAt: w.endsAt?.getTime(),
    weekday: w.weekday,
    startMinute: w.startMinute,
    durationMinutes: w.durationMinutes,
  }
  return {
    id: w.id,
    siteId: w.siteId,
    tankId: w.tankId,
    ruleId: w.ruleId,
    reason: w.reason,
    repeat: w.weekday === null ? 'once' : 'weekly',
    startsAt: w.startsAt?.toISOString() ?? null,
    endsAt: w.endsAt?.toISOString() ?? null,
    weekday: w.weekday,
    start: w.startMinute === null ? null : clockOf(w.startMinute),
    durationMinutes: w.durationMinutes,
    occurrences: occurrencesBetween(span, from, to, timeZone).map(([s, e]) => ({ startsAt: new Date(s).toISOString(), endsAt: new Date(e).toISOString() })),
  }
}

/** Maintenance windows of a site: planned quiet, evaluated and recorded, nobody told. */
export const maintenanceService = perContext((ctx: AppContext) => {
  const { models, events } = ctx
  // The engine reloads its windows with its rules.
  const changed = () => events.emit('rules.changed', { tankIds: 'all' })

  return {
    async list(actor: UserActor, siteId: number, range: { from?: string; to?: string }) {
      const site = await sitesService(ctx).find(actor, siteId)
      const from = range.from ? Date.parse(range.from) : Date.now()
      const to = range.to ? Date.parse(range.to) : from + 7 * 86400_000
      if (to <= from || to - from > 62 * 86400_000)
        throw badRequest('The range must end after it starts, within 62 days', { to: 'must be after from, within 62 days' })
      const rows = await models.MaintenanceWindow.findAll({
        where: { siteId, cancelledAt: null, [Op.or]: [{ endsAt: null }, { endsAt: { [Op.gt]: new Date(from) } }] },
        order: [['id', 'ASC']],
      })
      return rows.map((w) => present(w, site.timeZone, from, to))
    },

    async create(actor: UserActor, siteId: number, input: MaintenanceInput) {
      const site = await sitesService(ctx).find(actor, siteId)
      if (input.tankId && !(await models.Tank.findOne({ where: { id: input.tankId, siteId } })))
        throw badRequest('That tank is not on this site', { tankId: 'not a tank of this site' })
      if (input.ruleId && !(await models.WatchRule.findOne({ where: { id: input.ruleId, siteId } })))
        throw badRequest('That rule is not on this site', { ruleId: 'not a rule of this site' })
      const weekly = input.repeat === 'weekly'
      const row = await models.MaintenanceWindow.create({
        organizationId: actor.organizationId,
        siteId,
        tankId: input.tankId,
        ruleId: input.ruleId,
        reason: input.reason,
        startsAt: weekly ? null : new Date(input.startsAt!),
        endsAt: weekly ? null : new Date(input.endsAt!),
        weekday: weekly ? input.weekday! : null,
        startMinute: weekly ? minutesOfClock(input.start!) : null,
        durationMinutes: weekly ? input.durationMinutes! : null,
        createdBy: actor.userId,
      })
      changed()
      return present(row, site.timeZone, Date.now(), Date.now() + 7 * 86400_000)
    },

    async cancel(actor: UserActor, id: number) {
      const row = await models.MaintenanceWindow.findOne({ where: { id, organizationId: actor.organizationId } })
      if (!row) throw notFound('Maintenance window not found')
      const site = await sitesService(ctx).find(actor, row.siteId)
      if (!row.cancelledAt) {
        await row.update({ cancelledAt: new Date() })
        changed()
      }
      return present(row, site.timeZone, Date.now(), Date.now() + 7 * 86400_000)
    },
  }
})
