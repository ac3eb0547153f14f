// A night at one site, placed around the end of yesterday's working day (18:00 site time) of
// `now`, with what the overview must say about it. Shared by the API and the browser test.
import { endOfYesterdaysWorkday } from '@shared/overview/since'
import { localDateAt, weekdayOf } from '@shared/time/zoned'
import type { AppContext } from '../../server/context'
import { createTankRow, type TestOrg } from './fixtures'

const MIN = 60_000
const HOUR = 60 * MIN
const DAY = 24 * HOUR

export const NIGHT = {
  tanks: { reef1: 'Reef row 1', reef2: 'Reef row 2', reef3: 'Reef row 3', quarantine: 'Quarantine bay' },
  /** Minutes each incident took to be acknowledged. */
  ackMinutes: { heater: 14, quiet: 45 },
  titles: { heater: 'Temperature above 28 °C', quiet: 'No readings for 30 min', ph: 'pH below 7.6', old: 'Old nitrate warning' },
  care: { missed: 'Partial water change', kit: 'Weekly test-kit check', today: 'Clean the front glass', later: 'Rinse the filter sponge' },
  quarantineDaysIn: 6,
} as const

/** Seeds the night into the organisation's first site; `keeperName` and `ownerName` are who acknowledged. */
export async function seedNight(ctx: AppContext, org: TestOrg, now: Date) {
  const { models } = ctx
  const siteId = org.siteIds[0]
  const site = (await models.Site.findByPk(siteId))!
  const cutoff = endOfYesterdaysWorkday(site.timeZone, now.getTime())
  const at = (offsetMs: number) => new Date(cutoff + offsetMs)
  const tank = (name: string, stage: 'established' | 'quarantine' = 'established') =>
    createTankRow(ctx, org, {
      siteId,
      name,
      kind: 'marine',
      stage,
      dimensions: null,
      volumeLitres: 300,
      volumeSource: 'entered',
      heater: null,
      lightSchedule: null,
    })
  const reef1 = await tank(NIGHT.tanks.reef1)
  const reef2 = await tank(NIGHT.tanks.reef2)
  const reef3 = await tank(NIGHT.tanks.reef3)
  const quarantine = await tank(NIGHT.tanks.quarantine, 'quarantine')
  await ctx.sequelize.query('UPDATE tanks SET stage_changed_at = $1 WHERE id = $2', { bind: [new Date(now.getTime() - 6.5 * DAY), quarantine.id] })

  const incident = (tankId: number, fields: Record<string, unknown>) =>
    models.Incident.create({
      organizationId: org.organizationId,
      siteId,
      tankId,
      ruleKind: 'above',
      metric: 'temperature',
      severity: 'warning',
      title: '',
      state: 'open',
      conditionSince: fields.openedAt as Date,
      openedAt: fields.openedAt as Date,
      firstValue: null,
      peakValue: null,
      latestValue: null,
      latestAt: null,
      ...fields,
    })
  const { keeper, owner } = org.users
  await incident(reef1.id, { title: NIGHT.titles.old, metric: 'nitrate', openedAt: at(-6 * HOUR), state: 'resolved', resolvedAt: at(-5 * HOUR) })
  await incident(reef1.id, {
    title: NIGHT.titles.heater,
    openedAt: at(HOUR),
    state: 'resolved',
    acknowledgedAt: at(HOUR + NIGHT.ackMinutes.heater * MIN),
    acknowledgedBy: keeper.id,
    resolvedAt: at(2 * HOUR),
  })
  await incident(reef1.id, {
    title: NIGHT.titles.quiet,
    ruleKind: 'quiet',
    metric: 'temperature',
    openedAt: at(3 * HOUR),
    state: 'acknowledged',
    acknowledgedAt: at(3 * HOUR + NIGHT.ackMinutes.quiet * MIN),
    acknowledgedBy: owner.id,
  })
  await incident(reef2.id, { title: NIGHT.titles.ph, ruleKind: 'below', metric: 'ph', severity: 'alarm', openedAt: at(5 * HOUR) })

  // Reef row 3's probe last spoke half an hour before the earliest possible `now`: quiet now.
  await models.Device.create({
    organizationId: org.organizationId,
    tankId: reef3.id,
    name: 'Reef 3 probe',
    metrics: ['temperature'],
    intervalSeconds: 60,
    tokenHash: 'unused',
    lastSeenAt: at(5.5 * HOUR),
  })

  // Due dates count from the day a task was last done, on the site's calendar.
  const task = (tankId: number, kind: string, title: string, lastDoneAt: Date, everyDays: number) =>
    models.CareTask.create({
      organizationId: org.organizationId,
      tankId,
      kind: kind as 'other',
      title,
      recurrence: { kind: 'interval', everyDays },
      lastDoneAt,
    })
  await task(reef1.id, 'water_change', NIGHT.care.missed, at(-8 * DAY), 7) // due the day before yesterday
  await task(reef2.id, 'test_kit_check', NIGHT.care.kit, at(-7 * DAY), 7) // due yesterday
  await task(reef2.id, 'glass_clean', NIGHT.care.today, at(-6 * DAY), 7) // due today
  await task(reef3.id, 'filter_rinse', NIGHT.care.later, at(2 * HOUR), 14)

  await models.CareLogEntry.create({ organizationId: org.organizationId, tankId: reef2.id, kind: 'water_change', at: at(30 * MIN), userId: keeper.id })
  await models.CareLogEntry.create({ organizationId: org.organizationId, tankId: reef1.id, kind: 'water_change', at: at(-3 * HOUR), userId: keeper.id })

  // The keeper is on duty all of today (a shift whose end equals its start runs round the clock).
  const weekday = weekdayOf(localDateAt(site.timeZone, now.getTime()))
  await models.DutyShift.create({ organizationId: org.organizationId, siteId, userId: keeper.id, weekday, startTime: '00:00', endTime: '00:00' })
  return { siteId, cutoff: new Date(cutoff), tankIds: { reef1: reef1.id, reef2: reef2.id, reef3: reef3.id, quarantine: quarantine.id } }
}
