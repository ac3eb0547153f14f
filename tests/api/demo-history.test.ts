// The demo seed's month of history, read back from PostgreSQL the way the app reads it.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { lastEndedPeriod } from '@shared/report/period'
import { localDateAt, formatLocalDate } from '@shared/time/zoned'
import { seedDemoIfEmpty } from '../../server/demo/demo'
import { DEMO_BUILD_TANK } from '../../server/demo/demo-build'
import { HISTORY_DAYS, PLANNED_LATE } from '../../server/demo/demo-history/story'
import { buildReport, loadSubject } from '../../server/reports/report'
import { readPhotoBytes } from '../../server/photos/photos'
import { retentionCutoff } from '../../server/readings/retention'
import { startTestApp } from '../helpers/app'

const RAW_RETENTION_DAYS = 14
/** The shop's and fish room's nine live tanks and the three of the clients the business looks after. */
const LIVE_TANKS = 12
const DAY_MS = 86_400_000
const ZONE = 'Europe/Berlin'

let t: Awaited<ReturnType<typeof startTestApp>>
let dataDir: string
let now: number
const select = <T extends object>(sql: string, bind: unknown[] = []) => t.ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT })
const tankId = async (name: string) => (await select<{ id: number }>('SELECT id FROM tanks WHERE name = $1', [name]))[0]!.id

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-demo-'))
  // A short raw window, so the month holds both raw readings and the hours retention rolled up.
  t = await startTestApp({ dataDir, rawRetentionDays: RAW_RETENTION_DAYS, bcryptRounds: 4 })
  now = Date.now()
  const started = performance.now()
  expect(await seedDemoIfEmpty(t.ctx)).toBe(true)
  console.log(`[demo-history] seeding the demo with ${HISTORY_DAYS} days of history took ${((performance.now() - started) / 1000).toFixed(1)} s`)
}, 120_000)

afterAll(async () => {
  await t?.close()
  rmSync(dataDir, { recursive: true, force: true })
})

describe('the demo seed', () => {
  it('covers every live demo tank for 30 days: raw readings in the retention window, hourly rollups throughout', async () => {
    const cutoff = retentionCutoff({ rawRetentionDays: RAW_RETENTION_DAYS, now: new Date(now) }).getTime()
    const rows = await select<{ name: string; metric: string; raw_first: Date; raw_last: Date; raw: number; hours: number; hour_first: Date; hour_last: Date }>(
      `SELECT t.name, m.metric,
              (SELECT min(time) FROM readings r WHERE r.tank_id = t.id AND r.metric = m.metric AND r.source = 'device') AS raw_first,
              (SELECT max(time) FROM readings r WHERE r.tank_id = t.id AND r.metric = m.metric AND r.source = 'device') AS raw_last,
              (SELECT count(*)::int FROM readings r WHERE r.tank_id = t.id AND r.metric = m.metric AND r.source = 'device') AS raw,
              (SELECT count(*)::int FROM readings_hourly h WHERE h.tank_id = t.id AND h.metric = m.metric) AS hours,
              (SELECT min(hour) FROM readings_hourly h WHERE h.tank_id = t.id AND h.metric = m.metric) AS hour_first,
              (SELECT max(hour) FROM readings_hourly h WHERE h.tank_id = t.id AND h.metric = m.metric) AS hour_last
       FROM tanks t CROSS JOIN unnest(ARRAY['temperature','ph','light','water_level']) AS m(metric)
       WHERE t.stage <> 'empty' AND t.name <> $1 ORDER BY t.id, m.metric`,
      [DEMO_BUILD_TANK],
    )
    expect(rows).toHaveLength(LIVE_TANKS * 4)
    for (const r of rows) {
      const label = `${r.name} ${r.metric}`
      expect(r.hour_first.getTime(), label).toBeLessThanOrEqual(now - HISTORY_DAYS * DAY_MS)
      // Rollups hold every closed hour (up to half an hour or more before now), raw rows are kept from the cutoff on.
      expect(r.hour_last.getTime(), label).toBeGreaterThan(now - 3 * 3_600_000)
      expect(r.hour_last.getTime(), label).toBeLessThan(now - 30 * 60_000)
      expect(r.raw_first.getTime(), label).toBeGreaterThanOrEqual(cutoff)
      expect(r.raw_first.getTime(), label).toBeLessThan(cutoff + 10 * 60_000)
      expect(r.raw_last.getTime(), label).toBeGreaterThan(now - 10 * 60_000)
      // Every five minutes, less the hours a node was silent.
      expect(r.raw, label).toBeGreaterThan(((now - cutoff) / 300_000) * 0.98)
      expect(r.hours, label).toBeGreaterThan(((cutoff - (now - HISTORY_DAYS * DAY_MS)) / 3_600_000) * 0.98)
    }
  })

  it('gives heated tanks a thermostat cycle and the unheated tank the room’s day–night swing', async () => {
    // Daily max − min over the last five whole days (outside every planned fault).
    const amplitudes = await select<{ name: string; heated: boolean; median: number }>(
      `SELECT name, heated, percentile_cont(0.5) WITHIN GROUP (ORDER BY spread) AS median FROM (
         SELECT t.name, t.heater IS NOT NULL AS heated, date_trunc('day', r.time AT TIME ZONE $1) AS day, max(r.value) - min(r.value) AS spread
         FROM readings r JOIN tanks t ON t.id = r.tank_id
         WHERE r.metric = 'temperature' AND r.source = 'device' AND r.time >= $2 AND r.time < $3
         GROUP BY 1, 2, 3) d GROUP BY 1, 2`,
      [ZONE, new Date(now - 6 * DAY_MS), new Date(now - DAY_MS)],
    )
    expect(amplitudes).toHaveLength(LIVE_TANKS)
    for (const a of amplitudes) {
      // Heated: the thermostat's ±0.3 K switching band plus sensor noise (common practice for
      // aquarium thermostats: about half a degree). Unheated: the room's ±2 K, damped by the water.
      if (a.heated) expect(a.median, a.name).toBeGreaterThan(0.5)
      if (a.heated) expect(a.median, a.name).toBeLessThan(1.2)
      else expect(a.median, a.name).toBeGreaterThan(0.5)
      if (!a.heated) expect(a.median, a.name).toBeLessThan(3)
    }
  })

  it('moves pH with the light: up through the photoperiod as plants take up CO2, back down at night', async () => {
    const [planted] = await select<{ corr: number; lit: number; dark: number }>(
      `SELECT corr(p.value, l.value) AS corr, avg(p.value) FILTER (WHERE l.value > 0) AS lit, avg(p.value) FILTER (WHERE l.value = 0) AS dark
       FROM readings p JOIN readings l ON l.tank_id = p.tank_id AND l.time = p.time AND l.metric = 'light'
       WHERE p.metric = 'ph' AND p.source = 'device' AND p.tank_id = $1 AND p.time >= $2`,
      [await tankId('Display 2 — planted scape'), new Date(now - 7 * DAY_MS)],
    )
    // common practice: a planted tank swings about ±0.2 pH between day and night.
    expect(planted!.corr).toBeGreaterThan(0.6)
    expect(planted!.lit - planted!.dark).toBeGreaterThan(0.15)
    expect(planted!.lit - planted!.dark).toBeLessThan(0.45)
  })

  it('has a kit test every week on every live tank', async () => {
    const rows = await select<{ name: string; times: Date[] }>(
      `SELECT t.name, array_agg(k.taken_at ORDER BY k.taken_at) AS times FROM test_kit_entries k JOIN tanks t ON t.id = k.tank_id WHERE t.name <> $1 GROUP BY t.name`,
      [DEMO_BUILD_TANK],
    )
    expect(rows).toHaveLength(LIVE_TANKS)
    for (const r of rows) {
      expect(r.times.length, r.name).toBeGreaterThanOrEqual(4)
      r.times.slice(1).forEach((time, i) => expect(Math.round((time.getTime() - r.times[i]!.getTime()) / DAY_MS), r.name).toBe(7))
    }
  })

  it('has care tasks done on schedule, late exactly where planned', async () => {
    const tasks = await select<{ tank: string; kind: string; every: number; created: Date; done: Date[] }>(
      `SELECT t.name AS tank, c.kind, (c.recurrence->>'everyDays')::int AS every, c.created_at AS created,
              coalesce((SELECT array_agg(at ORDER BY at) FROM (
                 SELECT l.at FROM care_log l WHERE l.care_task_id = c.id AND l.kind = 'task_done'
                 UNION ALL SELECT w.finished_at FROM water_changes w WHERE c.kind = 'water_change' AND w.tank_id = c.tank_id AND w.status = 'finished') d), '{}') AS done
       FROM care_tasks c JOIN tanks t ON t.id = c.tank_id WHERE t.name <> $1 AND c.kind <> 'equipment_service'
         -- A probe's calibration task is ticked off by its calibration, not the care log.
         AND c.device_id IS NULL`,
      [DEMO_BUILD_TANK],
    )
    const late: Array<{ tank: string; kind: string; occurrence: number; daysLate: number }> = []
    const day = (ms: number) => Date.parse(formatLocalDate(localDateAt(ZONE, ms))) / DAY_MS
    for (const task of tasks) {
      let due = day(task.created.getTime())
      expect(task.done.length, `${task.tank} ${task.kind}`).toBeGreaterThan(0)
      task.done.forEach((at, occurrence) => {
        const doneDay = day(at.getTime())
        expect(doneDay, `${task.tank} ${task.kind} #${occurrence}`).toBeGreaterThanOrEqual(due)
        if (doneDay > due) late.push({ tank: task.tank, kind: task.kind, occurrence, daysLate: doneDay - due })
        due = doneDay + task.every
      })
      // Nothing left overdue from before yesterday.
      expect(due, `${task.tank} ${task.kind} next due`).toBeGreaterThanOrEqual(day(now) - 1)
    }
    expect(late.sort((a, b) => a.tank.localeCompare(b.tank))).toEqual([...PLANNED_LATE].sort((a, b) => a.tank.localeCompare(b.tank)))
  })

  it('has each pH probe calibrated, its care task not due', async () => {
    const rows = await select<{ slope_ok: boolean; last_done_at: Date | null }>(
      `SELECT c.slope_ok, t.last_done_at FROM calibrations c JOIN care_tasks t ON t.device_id = c.device_id`,
      [],
    )
    expect(rows.length).toBeGreaterThan(0)
    for (const r of rows) {
      expect(r.slope_ok).toBe(true)
      expect(r.last_done_at).not.toBeNull()
    }
  })

  it('logs each water change in the care log', async () => {
    const [row] = await select<{ changes: number; logged: number; bad: number }>(
      `SELECT count(*)::int AS changes, count(l.id)::int AS logged,
              count(*) FILTER (WHERE w.litres_replaced IS NULL OR (l.values->>'litres')::float8 <> w.litres_replaced)::int AS bad
       FROM water_changes w LEFT JOIN care_log l ON l.id = w.care_log_entry_id AND l.kind = 'water_change'`,
    )
    expect(row!.changes).toBeGreaterThanOrEqual(LIVE_TANKS * 4)
    expect(row!.logged).toBe(row!.changes)
    expect(row!.bad).toBe(0)
  })

  it('has past incidents acknowledged with notes and resolved, with their timelines', async () => {
    const incidents = await select<{
      id: number
      tank: string
      rule_kind: string
      state: string
      acknowledge_note: string | null
      resolve_note: string | null
      resolved_by: number | null
      kinds: string[]
    }>(
      `SELECT i.id, t.name AS tank, i.rule_kind, i.state, i.acknowledge_note, i.resolve_note, i.resolved_by,
              array_agg(e.kind ORDER BY e.at, e.id) AS kinds
       FROM incidents i JOIN tanks t ON t.id = i.tank_id JOIN incident_events e ON e.incident_id = i.id GROUP BY i.id, t.name`,
    )
    expect(incidents.map((i) => `${i.tank}: ${i.rule_kind}`).sort()).toEqual(
      expect.arrayContaining(['Breeding cylinder C1: above', 'Brackish B1: quiet', 'Display 1 — community: below', 'Reef display: quiet']),
    )
    for (const i of incidents) {
      expect(i.state, `${i.tank} ${i.rule_kind}`).toBe('resolved')
      expect(i.acknowledge_note?.length, `${i.tank} ${i.rule_kind}`).toBeGreaterThan(10)
      expect(i.resolve_note?.length, `${i.tank} ${i.rule_kind}`).toBeGreaterThan(5)
      expect(i.kinds.slice(0, 2)).toEqual(['opened', 'mail_queued'])
      expect(i.kinds).toContain('acknowledged')
      expect(i.kinds).toContain('resolved')
    }
    const byHand = incidents.find((i) => i.tank === 'Display 1 — community')!
    expect(byHand.resolved_by).not.toBeNull()
    expect(incidents.find((i) => i.tank === 'Breeding cylinder C1')!.kinds).toContain('escalated')
  })

  it('has one recent livestock arrival, in quarantine since it came', async () => {
    const [arrival, ...more] = await select<{ name: string; count: number; added_at: Date; watch_until: Date | null; stage: string; stage_changed_at: Date }>(
      `SELECT l.name, l.count, l.added_at, l.watch_until, t.stage, t.stage_changed_at FROM livestock l JOIN tanks t ON t.id = l.tank_id
       WHERE l.added_at > now() - interval '7 days'`,
    )
    expect(more).toEqual([])
    expect(arrival).toMatchObject({ name: 'Harlequin rasbora', count: 15, stage: 'quarantine' })
    expect(arrival!.stage_changed_at.getTime()).toBe(arrival!.added_at.getTime())
    expect(arrival!.watch_until!.getTime()).toBeGreaterThan(now)
  })

  it('has batches followed to the sales row and out, equipment with one lamp due, and one expired reagent', async () => {
    const batches = await select<{ name: string; tank: string; count: number; losses: number; moved_out: number; parent: boolean }>(
      `SELECT l.name, t.name AS tank, l.count, l.losses, l.moved_out, l.parent_id IS NOT NULL AS parent
       FROM livestock l JOIN tanks t ON t.id = l.tank_id WHERE l.added_at < now() - interval '7 days' ORDER BY l.id`,
    )
    expect(batches).toEqual([
      { name: 'Neon tetra', tank: 'Quarantine Q1', count: 24, losses: 2, moved_out: 16, parent: false },
      { name: 'Neon tetra', tank: 'Sales row A1', count: 16, losses: 0, moved_out: 5, parent: true },
      { name: 'Zebra danio', tank: 'Quarantine Q1', count: 10, losses: 0, moved_out: 10, parent: false },
    ])
    const due = await select<{ title: string; starts_on: string }>(
      `SELECT title, starts_on::text FROM care_tasks WHERE kind = 'equipment_service' AND active AND last_done_at IS NULL AND starts_on <= current_date`,
    )
    expect(due.map((d) => d.title)).toEqual(['Replace the lamp tube: Front lamp'])
    const expired = await select<{ name: string }>(`SELECT name FROM consumables WHERE expires_on < current_date`)
    expect(expired.map((c) => c.name)).toEqual(['Nitrite test reagent'])
  })

  it('has photos of a few tanks, stored in the photo store', async () => {
    const photos = await select<{ id: number; tank_id: number }>('SELECT id, tank_id FROM photos')
    expect(photos.length).toBeGreaterThanOrEqual(5)
    expect(new Set(photos.map((p) => p.tank_id)).size).toBeGreaterThanOrEqual(4)
    for (const p of photos) {
      const bytes = await readPhotoBytes(t.ctx, p.id, 'thumbnail')
      expect(bytes.subarray(0, 2).toString('hex')).toBe('ffd8')
    }
  })

  it('makes last week’s report read like a shop’s: nearly full coverage, time in band below 100 %', async () => {
    const subject = await loadSubject(t.ctx, { tankId: await tankId('Breeding cylinder C1'), siteId: null })
    const report = await buildReport(t.ctx, subject!, lastEndedPeriod('week', now, ZONE), new Date(now))
    const temperature = report.tanks[0]!.metrics.find((m) => m.metric === 'temperature')!
    expect(temperature.coveragePercent).toBeGreaterThan(99)
    expect(temperature.timeInBandPercent).toBeLessThan(100)
    expect(temperature.timeInBandPercent).toBeGreaterThan(90)
    expect(report.tanks[0]!.incidents.length).toBeGreaterThanOrEqual(1)
    expect(report.tanks[0]!.care.done).toBeGreaterThan(0)
  })

  it("has two clients with tanks at their own sites, yesterday's visits closed with their reports, and today's round", async () => {
    const clients = await select<{ name: string; sites: string[]; tanks: number }>(
      `SELECT c.name, array_agg(DISTINCT s.name ORDER BY s.name) AS sites, count(t.id)::int AS tanks
       FROM clients c JOIN tanks t ON t.client_id = c.id JOIN sites s ON s.id = t.site_id GROUP BY c.name ORDER BY c.name`,
    )
    expect(clients).toEqual([
      { name: 'Harbourlight Dental Practice', sites: ['Harbourlight — Mill Lane clinic', 'Harbourlight — Quay Road surgery'], tanks: 2 },
      { name: 'Ingrid Palesworth', sites: ['Palesworth home'], tanks: 1 },
    ])
    // No client's tank stands at the business's own sites.
    const mixed = await select<{ n: number }>(
      `SELECT count(*)::int AS n FROM tanks t JOIN tanks o ON o.site_id = t.site_id AND o.client_id IS DISTINCT FROM t.client_id WHERE t.client_id IS NOT NULL`,
    )
    expect(mixed[0]!.n).toBe(0)
    const day = (at: Date) => formatLocalDate(localDateAt(ZONE, at.getTime()))
    const today = formatLocalDate(localDateAt(ZONE, now))
    const visits = await select<{ state: string; starts_at: Date; work: Array<{ readings: unknown[] }>; photo_ids: number[] }>(
      'SELECT state, starts_at, work, photo_ids FROM visits ORDER BY starts_at',
    )
    const closed = visits.filter((v) => v.state === 'closed')
    expect(closed.map((v) => day(v.starts_at))).toHaveLength(2)
    for (const v of closed) {
      expect(day(v.starts_at) < today).toBe(true)
      expect(v.photo_ids).toHaveLength(1)
    }
    expect(visits.filter((v) => v.state === 'planned').map((v) => day(v.starts_at))).toEqual([today, today, today])
    // The demo's past sends no mail: its history was mailed at the time.
    expect((await select<{ n: number }>('SELECT count(*)::int AS n FROM mail_outbox'))[0]!.n).toBe(0)
  })

  it('has the reef display’s salinity, calcium, magnesium and phosphate from its weekly kit tests', async () => {
    const rows = await select<{ metric: string; n: number; lo: number; hi: number }>(
      `SELECT metric, count(*)::int AS n, min(value) AS lo, max(value) AS hi FROM readings
       WHERE tank_id = $1 AND source = 'test_kit' AND metric IN ('salinity', 'calcium', 'magnesium', 'phosphate') GROUP BY metric ORDER BY metric`,
      [await tankId('Reef display')],
    )
    expect(rows.map((r) => r.metric)).toEqual(['calcium', 'magnesium', 'phosphate', 'salinity'])
    const [entries] = await select<{ n: number }>(
      `SELECT count(*)::int AS n FROM test_kit_entries WHERE tank_id = $1 AND values @> '[{"metric": "salinity"}]'`,
      [await tankId('Reef display')],
    )
    expect(entries!.n).toBeGreaterThanOrEqual(4)
    // Inside the marine default bands (common practice): salinity 33.5–35.5, calcium 380–450.
    const salinity = rows.find((r) => r.metric === 'salinity')!
    expect(salinity.lo).toBeGreaterThanOrEqual(33.5)
    expect(salinity.hi).toBeLessThanOrEqual(35.5)
  })

  it('has the quarantine tank on day 4 of a treatment course, its dose and tests due today and done on the days before', async () => {
    const [course] = await select<{ id: number; starts_on: string; ends_on: string }>(
      `SELECT id, starts_on::text, ends_on::text FROM treatment_courses WHERE tank_id = $1`,
      [await tankId('Quarantine Q1')],
    )
    const today = formatLocalDate(localDateAt(ZONE, now))
    expect(course!.starts_on).toBe(formatLocalDate(localDateAt(ZONE, Date.parse(`${today}T12:00:00Z`) - 3 * DAY_MS)))
    const tasks = await select<{ title: string; done: number; ends_on: string }>(
      `SELECT c.title, c.ends_on::text, (SELECT count(*)::int FROM care_log l WHERE l.care_task_id = c.id) AS done FROM care_tasks c WHERE c.treatment_course_id = $1`,
      [course!.id],
    )
    expect(tasks).toHaveLength(3)
    for (const task of tasks) expect(task).toMatchObject({ done: 3, ends_on: course!.ends_on })
  })
})
