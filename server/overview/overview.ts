import { QueryTypes } from 'sequelize'
import type { Overview, OverviewIncident, OverviewSite, OverviewTask } from '@shared/schemas/overview'
import { DEFAULT_WORKDAY_END, endOfYesterdaysWorkday, minutesToAcknowledge } from '@shared/overview/since'
import { TANK_STATES } from '@shared/schemas/tank-status'
import type { UserActor } from '../access/actor'
import { siteScope } from '../access/scope'
import type { AppContext } from '../context'
import { dueItems, tanksToWatch } from '../care'
import { whoIsOnDuty } from '../roster'
import { checklistService } from '../setup'
import { tankStatuses } from '../tanks'
import { visitsLeftOpen } from '../visits'

type SiteRow = { id: number; name: string; timeZone: string; workdayEnd: string | null }
type IncidentRow = {
  id: number
  title: string
  severity: string
  state: OverviewIncident['state']
  ruleKind: string
  tankId: number
  tankName: string
  openedAt: Date
  acknowledgedAt: Date | null
  ackUserId: number | null
  ackUserName: string | null
}

/**
 * The owner's and keepers' morning page, per site they may see: what happened since the end of
 * yesterday's working day, what today holds, and how every tank is now. `now` is injectable.
 */
export function overviewService(ctx: AppContext) {
  const { models, sequelize } = ctx

  async function incidentsSince(siteId: number, since: Date, now: Date) {
    // Opened since the end of yesterday, and any older one that is still not resolved.
    return sequelize.query<IncidentRow>(
      `SELECT i.id, i.title, i.severity, i.state, i.rule_kind AS "ruleKind", i.tank_id AS "tankId", t.name AS "tankName",
              i.opened_at AS "openedAt", i.acknowledged_at AS "acknowledgedAt", u.id AS "ackUserId", u.name AS "ackUserName"
       FROM incidents i JOIN tanks t ON t.id = i.tank_id LEFT JOIN users u ON u.id = i.acknowledged_by
       WHERE i.site_id = :siteId AND i.opened_at <= :now AND (i.opened_at >= :since OR i.state <> 'resolved')
       ORDER BY i.opened_at, i.id`,
      { type: QueryTypes.SELECT, replacements: { siteId, since, now } },
    )
  }

  async function waterChangesSince(siteId: number, since: Date, now: Date) {
    // A finished water change writes its own entry; ticking a water-change task done writes `task_done`.
    return sequelize.query<{ tankId: number; tankName: string; at: Date; by: string | null }>(
      `SELECT l.tank_id AS "tankId", t.name AS "tankName", l.at, u.name AS by
       FROM care_log l JOIN tanks t ON t.id = l.tank_id LEFT JOIN care_tasks ct ON ct.id = l.care_task_id LEFT JOIN users u ON u.id = l.user_id
       WHERE t.site_id = :siteId AND l.at >= :since AND l.at <= :now
         AND (l.kind = 'water_change' OR (l.kind = 'task_done' AND ct.kind = 'water_change'))
       ORDER BY l.at, l.id`,
      { type: QueryTypes.SELECT, replacements: { siteId, since, now } },
    )
  }

  async function forSite(site: SiteRow, now: Date): Promise<OverviewSite> {
    const workdayEnd = site.workdayEnd ?? DEFAULT_WORKDAY_END
    const since = new Date(endOfYesterdaysWorkday(site.timeZone, now.getTime(), workdayEnd))
    const tanks = await models.Tank.findAll({
      where: { siteId: site.id, archivedAt: null },
      order: [
        ['name', 'ASC'],
        ['id', 'ASC'],
      ],
    })
    const [statuses, incidents, care, waterChanges, duty, watch, openVisits] = await Promise.all([
      tankStatuses(ctx, tanks, now.getTime()),
      incidentsSince(site.id, since, now),
      dueItems(ctx, { siteIds: [site.id] }, now),
      waterChangesSince(site.id, since, now),
      whoIsOnDuty(ctx, site.id, now),
      tanksToWatch(ctx, [site.id], now),
      visitsLeftOpen(ctx, site, now),
    ])
    const states = Object.fromEntries(TANK_STATES.map((s) => [s, 0])) as OverviewSite['states']
    for (const status of statuses.values()) states[status.state]++

    const quiet = new Map<number, { tank: { id: number; name: string }; since: string | null; quietNow: boolean }>()
    for (const i of incidents) {
      if (i.ruleKind !== 'quiet' || quiet.has(i.tankId)) continue
      quiet.set(i.tankId, { tank: { id: i.tankId, name: i.tankName }, since: new Date(i.openedAt).toISOString(), quietNow: false })
    }
    for (const tank of tanks) {
      if (statuses.get(tank.id)?.state !== 'quiet') continue
      const known = quiet.get(tank.id)
      quiet.set(tank.id, known ? { ...known, quietNow: true } : { tank: { id: tank.id, name: tank.name }, since: null, quietNow: true })
    }

    const task = (item: (typeof care)[number]): OverviewTask => ({
      taskId: item.task.id,
      title: item.task.title,
      kind: item.task.kind,
      tank: { id: item.tank.id, name: item.tank.name },
      dueOn: item.due.dueOn,
    })
    const unsnoozed = care.filter((c) => !c.due.snoozed)
    const overdue = unsnoozed.filter((c) => c.due.status === 'overdue').sort((a, b) => a.due.dueOn.localeCompare(b.due.dueOn))

    return {
      site: { id: site.id, name: site.name, timeZone: site.timeZone },
      since: since.toISOString(),
      workdayEnd,
      workdayEndAssumed: site.workdayEnd == null,
      states,
      overnight: {
        incidents: incidents.map((i) => ({
          id: i.id,
          title: i.title,
          severity: i.severity,
          state: i.state,
          tank: { id: i.tankId, name: i.tankName },
          openedAt: new Date(i.openedAt).toISOString(),
          acknowledgedAt: i.acknowledgedAt ? new Date(i.acknowledgedAt).toISOString() : null,
          acknowledgedBy: i.ackUserId ? { id: i.ackUserId, name: i.ackUserName ?? '' } : null,
          ackMinutes: minutesToAcknowledge(new Date(i.openedAt), i.acknowledgedAt ? new Date(i.acknowledgedAt) : null),
        })),
        quietTanks: [...quiet.values()],
        careMissed: overdue.filter((c) => c.task.kind !== 'test_kit_check').map(task),
        kitOverdue: overdue.filter((c) => c.task.kind === 'test_kit_check').map(task),
        waterChanges: waterChanges.map((w) => ({ tank: { id: w.tankId, name: w.tankName }, at: new Date(w.at).toISOString(), by: w.by })),
        visitsLeftOpen: openVisits,
      },
      today: {
        onDuty: duty.onDuty.map((p) => ({ id: p.userId, name: p.name })),
        backup: duty.backup ? { id: duty.backup.userId, name: duty.backup.name } : null,
        careDue: unsnoozed.filter((c) => c.due.status === 'due_today').map(task),
        quarantine: watch.filter((w) => w.quarantine).map((w) => ({ tank: w.tank, daysIn: w.quarantine!.daysIn, days: w.quarantine!.days })),
      },
    }
  }

  return {
    async get(actor: UserActor, now = new Date()): Promise<Overview> {
      const sites = await models.Site.findAll({
        where: { ...(siteScope(actor, 'id') as object), archivedAt: null },
        attributes: ['id', 'name', 'timeZone', 'workdayEnd'],
        order: [
          ['name', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const rows = sites.map((s) => ({ id: s.id, name: s.name, timeZone: s.timeZone, workdayEnd: s.workdayEnd ?? null }))
      const checklist = actor.role === 'owner' ? await checklistService(ctx).forOwner(actor) : null
      return { now: now.toISOString(), sites: await Promise.all(rows.map((s) => forSite(s, now))), checklist }
    },
  }
}
