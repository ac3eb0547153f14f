import type { AppContext } from '../../server/context'
import { createTankRow, type TestOrg } from './fixtures'

/**
 * A demo-like week for one tank, worked out by hand so the report's numbers can be checked.
 * Week 45 of 2026 on Europe/Berlin's calendar: Monday 2 November 00:00 CET (01 Nov 23:00 UTC) to
 * Monday 9 November 00:00 CET, 168 h. Site A of the test organization is in Europe/Berlin.
 */
export const WEEK = { date: '2026-11-04', startDate: '2026-11-02', endDate: '2026-11-09', from: Date.parse('2026-11-01T23:00:00Z') }
const H = 3_600_000
const MIN = 60_000

export const EXPECTED = {
  temperature: {
    // Every 10 min from 0 to 168 h; none strictly between 48 h and 60 h (a 12 h gap); 29 °C for
    // the 12 readings from 100 h (2 h above 28 °C), 26 °C otherwise. 1008 steps − 71 missing = 937 inside.
    readings: 937,
    coveragePercent: (156 / 168) * 100,
    timeInBandPercent: (154 / 156) * 100,
    aboveMs: 2 * H,
    mean: (26 * 154 + 29 * 2) / 156,
    min: 26,
    max: 29,
    gaps: [{ from: new Date(WEEK.from + 48 * H).toISOString(), to: new Date(WEEK.from + 60 * H).toISOString(), durationMs: 12 * H }],
  },
  ph: { readings: 168, coveragePercent: 100, timeInBandPercent: 100, mean: 7.2 },
  incidents: { opened: 2, stillOpen: 1, meanTimeToAcknowledgeMs: 20 * MIN, meanTimeToResolveMs: 70 * MIN },
  // Glass: Mondays and Thursdays, done Monday only (2 due, 1 done). Water change every 7 days,
  // done 26 Oct (→ due 2 Nov) and 4 Nov (→ due 11 Nov, after the week): 1 due, 1 done.
  care: { due: 3, done: 2 },
  water: { changes: 1, litres: 40 },
  livestock: { added: 6, removed: 2, lost: 1 },
}

export async function seedReportWeek(ctx: AppContext, org: TestOrg, name = 'Marrowfen display') {
  const { models, sequelize } = ctx
  const organizationId = org.organizationId
  const siteId = org.siteIds[0]!
  const tank = await createTankRow(ctx, org, {
    siteId,
    name,
    dimensions: null,
    volumeSource: 'entered',
    lightSchedule: null,
    targets: { temperature: { min: 24, max: 28 }, ph: { min: 6.8, max: 7.6 } },
  })
  const from = new Date(WEEK.from).toISOString()
  await sequelize.query(
    `
    INSERT INTO readings (source_key, metric, time, tank_id, value, source)
    SELECT 'd:report-week', 'temperature', $1::timestamptz + n * interval '10 minutes', $2,
           CASE WHEN n >= 600 AND n < 612 THEN 29 ELSE 26 END, 'device'
    FROM generate_series(0, 1008) n WHERE NOT (n > 288 AND n < 360)`,
    { bind: [from, tank.id] },
  )
  await sequelize.query(
    `
    INSERT INTO readings (source_key, metric, time, tank_id, value, source)
    SELECT 'd:report-week', 'ph', $1::timestamptz + n * interval '1 hour', $2, 7.2, 'device' FROM generate_series(0, 168) n`,
    { bind: [from, tank.id] },
  )

  const at = (iso: string) => new Date(iso)
  const incident = (openedAt: string, ack: string | null, resolved: string | null, title: string) =>
    models.Incident.create({
      organizationId,
      siteId,
      tankId: tank.id,
      ruleId: null,
      ruleKind: 'above',
      metric: 'temperature',
      severity: 'alarm',
      title,
      state: resolved ? 'resolved' : ack ? 'acknowledged' : 'open',
      conditionSince: at(openedAt),
      openedAt: at(openedAt),
      firstValue: 28.6,
      peakValue: 29,
      latestValue: 28.6,
      latestAt: at(openedAt),
      acknowledgedAt: ack ? at(ack) : null,
      resolvedAt: resolved ? at(resolved) : null,
    })
  await incident('2026-11-03T10:00:00Z', '2026-11-03T10:10:00Z', '2026-11-03T11:10:00Z', 'Temperature above 28 °C for 10 min')
  await incident('2026-11-06T08:00:00Z', '2026-11-06T08:30:00Z', null, 'Temperature above 28 °C <b>again</b>')
  await incident('2026-10-30T08:00:00Z', null, null, 'Before the week')

  const glass = await models.CareTask.create({
    organizationId,
    tankId: tank.id,
    kind: 'glass_clean',
    title: 'Clean the glass',
    recurrence: { kind: 'weekdays', weekdays: [0, 3] },
    startsOn: '2026-10-01',
  })
  const water = await models.CareTask.create({
    organizationId,
    tankId: tank.id,
    kind: 'water_change',
    title: 'Weekly water change',
    recurrence: { kind: 'interval', everyDays: 7 },
    startsOn: '2026-10-19',
  })
  // Tasks made before the week: created_at is set by the database, so it is moved back here.
  await sequelize.query(`UPDATE care_tasks SET created_at = '2026-10-01T08:00:00Z' WHERE id IN ($1, $2)`, { bind: [glass.id, water.id] })
  await models.CareLogEntry.create({
    organizationId,
    tankId: tank.id,
    kind: 'task_done',
    at: at('2026-11-02T10:00:00Z'),
    userId: null,
    text: 'Clean the glass',
    careTaskId: glass.id,
  })
  const change = (finishedAt: string, litres: number) =>
    models.WaterChange.create({
      organizationId,
      tankId: tank.id,
      status: 'finished',
      plan: {},
      heaterOffConfirmed: true,
      startedAt: at(finishedAt),
      startedBy: null,
      finishedAt: at(finishedAt),
      litresReplaced: litres,
    })
  await change('2026-10-26T10:00:00Z', 30)
  await change('2026-11-04T10:00:00Z', 40)

  const log = (kind: 'livestock_in' | 'livestock_out', when: string, text: string, values: Record<string, number>) =>
    models.CareLogEntry.create({ organizationId, tankId: tank.id, kind, at: at(when), userId: null, text, values })
  await log('livestock_in', '2026-11-03T09:00:00Z', 'Added 6 × Ember tetra', { count: 6 })
  await log('livestock_out', '2026-11-05T09:00:00Z', '1 × Ember tetra lost', { losses: 1 })
  await log('livestock_out', '2026-11-07T09:00:00Z', 'Cherry shrimp removed', { count: 2 })
  await log('livestock_in', '2026-10-28T09:00:00Z', 'Added 3 × Before the week', { count: 3 })
  return tank
}
