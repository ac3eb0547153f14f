import { Op } from 'sequelize'
import type { PublicWallCredential, WallResponse, WallTank, WallTrendPoint, WallTrendsResponse } from '@shared/schemas/wall'
import { compareForWall } from '@shared/tank-state'
import { occurrenceAt } from '@shared/rules/maintenance'
import type { Actor, UserActor } from '../access/actor'
import { newWallToken } from './wall-tokens'
import { buildDaysFor } from '../builds'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import type { WallCredential } from '../models'
import { scheduleFn, snoozeCovers } from '../incidents'
import { careDueCounts } from '../care'
import { whoIsOnDuty } from '../roster'
import { clockStyleOf } from '../people'
import { canSeeSite } from '../access/scope'
import { tankStatuses } from '../tanks'
import { perContext } from '../platform/per-context'
import { temperatureTrends } from '../readings'

const TREND_HOURS = 6
const LIGHT_ON_LUX = 50

function presentCredential(c: WallCredential): PublicWallCredential {
  return {
    id: c.id,
    name: c.name,
    siteId: c.siteId,
    createdAt: c.createdAt.toISOString(),
    lastUsedAt: c.lastUsedAt?.toISOString() ?? null,
    revokedAt: c.revokedAt?.toISOString() ?? null,
  }
}

/** The wall: every tank of a site with its state, in the order a keeper should look at them. */
export const wallService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function visibleSite(actor: Actor, siteId: number) {
    const site = await models.Site.findByPk(siteId)
    if (!site || !canSeeSite(actor, site)) throw notFound('Site not found')
    return site
  }

  /** Each tank's temperature in 15-minute means, one row per tank (a row per point costs a large site more than the query). */
  async function trends(tankIds: number[], now: number) {
    if (!tankIds.length) return new Map<number, WallTrendPoint[]>()
    const rows = await temperatureTrends(sequelize, tankIds, new Date(now - TREND_HOURS * 3600_000), new Date(now))
    return new Map(rows.map((r) => [r.tank_id, r.trend as WallTrendPoint[]]))
  }

  return {
    /**
     * The wall in its order. `trendTanks`: only that many tanks from the top bring their trend line
     * (the six-hour scan is most of a large site's cost, and a screen shows a page of tiles at a time).
     */
    async get(actor: Actor, siteId: number, trendTanks?: number): Promise<WallResponse> {
      const site = await visibleSite(actor, siteId)
      const now = Date.now()
      // Plain rows: a large site's wall would otherwise build a model instance per tank only to read it.
      const tanks = await models.Tank.findAll({
        where: { siteId, archivedAt: null },
        order: [
          ['sortOrder', 'ASC'],
          ['name', 'ASC'],
        ],
        raw: true,
      })
      const ids = tanks.map((t) => t.id)
      const [statuses, snoozes, duty, care, settling, windows, siteIncidents, clockStyle] = await Promise.all([
        tankStatuses(ctx, tanks, now),
        models.Snooze.findAll({
          where: { tankId: ids, cancelledAt: null, [Op.or]: [{ endsAt: { [Op.gt]: new Date(now) } }, { repeatUntil: { [Op.gt]: new Date(now) } }] },
        }),
        whoIsOnDuty(ctx, siteId, new Date(now)),
        careDueCounts(ctx, { siteIds: [siteId] }, new Date(now)),
        models.Incident.findAll({ where: { tankId: ids, state: 'resolved', flapCount: { [Op.gt]: 0 }, settleUntil: { [Op.gt]: new Date(now) } } }),
        models.MaintenanceWindow.findAll({
          where: { siteId, ruleId: null, cancelledAt: null, [Op.or]: [{ endsAt: null }, { endsAt: { [Op.gt]: new Date(now) } }] },
        }),
        models.SiteIncident.findAll({ where: { siteId, state: { [Op.ne]: 'resolved' } }, order: [['openedAt', 'DESC']] }),
        clockStyleOf(ctx, site.organizationId),
      ])
      const maintenanceOf = (tankId: number) => {
        for (const w of windows) {
          if (w.tankId !== null && w.tankId !== tankId) continue
          const span = occurrenceAt(
            {
              startsAt: w.startsAt?.getTime(),
              endsAt: w.endsAt?.getTime(),
              weekday: w.weekday,
              startMinute: w.startMinute,
              durationMinutes: w.durationMinutes,
            },
            now,
            site.timeZone,
          )
          if (span) return { until: new Date(span[1]).toISOString(), reason: w.reason }
        }
        return null
      }
      const open = [...statuses.entries()].flatMap(([tankId, status]) => status.openIncidents.map((i) => ({ ...i, tankId })))
      const wallTanks: WallTank[] = tanks.map((tank) => {
        const { state, stateReasons, latest: metrics, openIncidents: incidents } = statuses.get(tank.id)!
        const worst = [...incidents].sort((a, b) => (a.severity === b.severity ? 0 : a.severity === 'alarm' ? -1 : 1))[0]
        const snooze = snoozes.find((s) => s.tankId === tank.id && snoozeCovers(s, now))
        const times = Object.values(metrics)
          .map((m) => m?.time)
          .filter(Boolean) as string[]
        const light = metrics.light
        const flapper = [...incidents, ...settling.filter((i) => i.tankId === tank.id)].find((i) => i.flapCount > 0)
        const maintenance = maintenanceOf(tank.id)
        return {
          id: tank.id,
          name: tank.name,
          kind: tank.kind,
          stage: tank.stage,
          sortOrder: tank.sortOrder,
          volumeLitres: tank.volumeLitres,
          heightCm: tank.dimensions?.heightCm ?? null,
          heater: tank.heater,
          lightSchedule: tank.lightSchedule,
          targets: tank.targets,
          latest: metrics,
          trend: null,
          state,
          stateReasons,
          openIncident: worst
            ? {
                id: worst.id,
                title: worst.title,
                severity: worst.severity,
                openedAt: worst.openedAt,
                state: worst.state,
                maintenance: worst.maintenance,
                siteIncidentId: worst.siteIncidentId,
              }
            : null,
          flapping: flapper ? { count: flapper.flapCount, title: flapper.title } : null,
          maintenanceUntil: maintenance?.until ?? null,
          maintenanceReason: maintenance?.reason ?? null,
          snoozedUntil: snooze ? snooze.endsAt.toISOString() : null,
          lightOn: light ? light.value >= LIGHT_ON_LUX : null,
          lightScheduledOn: tank.lightSchedule ? scheduleFn(tank.lightSchedule, site.timeZone)(now) : null,
          newestReadingAt: times.length ? times.sort().at(-1)! : null,
        }
      })
      const buildDays = await buildDaysFor(ctx, ids, site.timeZone, new Date(now))
      for (const t of wallTanks) t.buildDay = buildDays.get(t.id) ?? null
      wallTanks.sort(compareForWall)
      const drawn = trendTanks === undefined ? wallTanks : wallTanks.slice(0, trendTanks)
      const trend = await trends(
        drawn.map((t) => t.id),
        now,
      )
      for (const t of drawn) t.trend = trend.get(t.id) ?? []
      return {
        site: { id: site.id, name: site.name, timeZone: site.timeZone, clockStyle },
        generatedAt: new Date(now).toISOString(),
        tanks: wallTanks,
        onDuty: duty.onDuty.map((d) => ({ userId: d.userId, name: d.name })),
        backupContact: duty.backup ? { userId: duty.backup.userId, name: duty.backup.name } : null,
        openIncidents: open.length,
        siteIncidents: siteIncidents.map((si) => ({
          id: si.id,
          title: si.title,
          severity: si.severity,
          state: si.state === 'acknowledged' ? 'acknowledged' : 'open',
          tanks: new Set(open.filter((i) => i.siteIncidentId === si.id).map((i) => i.tankId)).size,
        })),
        overdueCareTasks: care.bySite.get(siteId)?.overdue ?? 0,
      }
    },

    /** The trend lines of these tanks of the site (others are left out), for the wall's later pages. */
    async trends(actor: Actor, siteId: number, tankIds: number[]): Promise<WallTrendsResponse> {
      await visibleSite(actor, siteId)
      const tanks = await models.Tank.findAll({ where: { id: tankIds, siteId, archivedAt: null }, attributes: ['id'], order: [['id', 'ASC']], raw: true })
      const ids = tanks.map((t) => t.id)
      const lines = await trends(ids, Date.now())
      return { trends: ids.map((tankId) => ({ tankId, trend: lines.get(tankId) ?? [] })) }
    },

    async listCredentials(actor: UserActor, siteId: number) {
      await visibleSite(actor, siteId)
      const rows = await models.WallCredential.findAll({ where: { siteId, organizationId: actor.organizationId }, order: [['createdAt', 'DESC']] })
      return rows.map(presentCredential)
    },

    async createCredential(actor: UserActor, siteId: number, name: string) {
      await visibleSite(actor, siteId)
      const row = await models.WallCredential.create({ organizationId: actor.organizationId, siteId, name, tokenHash: 'pending', createdBy: actor.userId })
      const { token, hash } = newWallToken(row.id)
      await row.update({ tokenHash: hash })
      return { credential: presentCredential(row), link: `/wall/${siteId}?key=${token}` }
    },

    async revokeCredential(actor: UserActor, id: number) {
      const row = await models.WallCredential.findOne({ where: { id, organizationId: actor.organizationId } })
      if (!row) throw notFound('Wall display not found')
      await row.update({ revokedAt: new Date() })
      ctx.events.emit('wall.revoked', { credentialId: row.id })
      return presentCredential(row)
    },
  }
})
