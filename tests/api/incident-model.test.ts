import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { WatchRuleSpecInput } from '@shared/rules/schema'
import type { ReadingRow } from '../../server/readings/batch-writer'
import { createRuleEngine, type RuleEngine } from '../../server/incidents/engine'
import { createMailNotifier } from '../../server/incidents/mail-notifier'
import type { IncidentNotifier, NotifyKind } from '../../server/incidents/notifier'
import { incidentsService, type AlertTiming } from '../../server/incidents/incidents'
import { startTestApp } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'

const MIN = 60_000
const timing: AlertTiming = { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }

let t: Awaited<ReturnType<typeof startTestApp>>
let clock = 0
const told: Array<{ kind: NotifyKind; incidentId: number; to?: number }> = []
const recorder: IncidentNotifier = {
  notify: async (kind, incident, _transaction, options) => {
    told.push({ kind, incidentId: incident.id, ...(options?.userId ? { to: options.userId } : {}) })
    return ['keeper@example.test']
  },
}

beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())
beforeEach(() => {
  told.length = 0
})

function engineAt(start: number, notifier: IncidentNotifier = recorder, extra: Partial<AlertTiming> = {}): RuleEngine {
  clock = start
  return createRuleEngine(t.ctx, incidentsService(t.ctx, notifier, { ...timing, ...extra }), { now: () => clock })
}

async function addRule(org: TestOrg, tankId: number, name: string, severity: 'warning' | 'alarm', spec: WatchRuleSpecInput) {
  const rule = await t.ctx.models.WatchRule.create({ organizationId: org.organizationId, siteId: org.siteIds[0], tankId, name, severity, spec: spec as never })
  return rule.id
}

async function store(tankId: number, deviceId: number, metric: string, points: Array<[number, number]>) {
  const rows: ReadingRow[] = points.map(([at, value]) => ({ sourceKey: `d:${deviceId}`, metric, time: new Date(at), tankId, value, source: 'device' }))
  await t.ctx.readings.writer.write(rows)
}

const incidentsOf = (tankId: number) => t.ctx.models.Incident.findAll({ where: { tankId }, order: [['id', 'ASC']] })
const timelineOf = async (incidentId: number) =>
  (await t.ctx.models.IncidentEvent.findAll({ where: { incidentId }, order: [['id', 'ASC']] })).map((e) => e.kind)

async function onDutyAroundTheClock(org: TestOrg, userIds: number[]) {
  for (const userId of userIds) {
    for (let weekday = 0; weekday < 7; weekday++) {
      await t.ctx.models.DutyShift.create({ organizationId: org.organizationId, siteId: org.siteIds[0], userId, weekday, startTime: '00:00', endTime: '00:00' })
    }
  }
}

const outbox = (where: string, bind: unknown[]) =>
  t.ctx.sequelize.query<{ kind: string; to_address: string; subject: string; text_body: string }>(
    `SELECT kind, to_address, subject, text_body FROM mail_outbox WHERE ${where} ORDER BY id`,
    { bind, type: QueryTypes.SELECT },
  )

describe('one fault is one incident', () => {
  it('a heater-line fault passing warning to alarm is one incident with two severities and at most two mails', async () => {
    const org = await t.createOrg('Ladder Org')
    const tank = await createTankWithDevice(t.ctx, org, 'Ladder tank') // heater top at 30 cm
    await addRule(org, tank.tankId, 'Water level within 2 cm of the heater top', 'warning', {
      kind: 'heater_line',
      marginCm: 2,
      holdMinutes: 0,
      clearMargin: 0.5,
    })
    await addRule(org, tank.tankId, 'Water level at or below the heater top', 'alarm', { kind: 'heater_line', marginCm: 0, holdMinutes: 0, clearMargin: 0.5 })
    const t0 = Date.now() - 6 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    const levels = [40, 35, 31.5, 31, 29.5, 29, 31.2, 33]
    for (const [i, level] of levels.entries()) {
      clock = t0 + i * MIN
      await store(tank.tankId, tank.deviceId, 'water_level', [[clock, level]])
      await engine.settle()
      await engine.tick(clock)
    }
    await engine.tick(t0 + 60 * MIN) // past the settle window: the all-clear
    const incidents = await incidentsOf(tank.tankId)
    expect(incidents).toHaveLength(1)
    expect(incidents[0]).toMatchObject({ state: 'resolved', severity: 'warning', topSeverity: 'alarm' })
    const timeline = await timelineOf(incidents[0].id)
    expect(timeline.filter((k) => k !== 'mail_queued')).toEqual(['opened', 'severity_raised', 'severity_lowered', 'resolved'])
    const alerts = told.filter((x) => x.kind !== 'resolved')
    expect(alerts.map((x) => x.kind)).toEqual(['opened', 'raised'])
    expect(alerts.length).toBeLessThanOrEqual(2)
    await engine.stop()
  })

  it('a condition flapping ten times in 30 minutes is one incident and one mail; one that then holds past its hold is mailed again', async () => {
    const org = await t.createOrg('Flap Org')
    const tank = await createTankWithDevice(t.ctx, org, 'Flap tank')
    await addRule(org, tank.tankId, 'Temperature above 28 °C', 'warning', { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 0, clearMargin: 0.5 })
    const t0 = Date.now() - 8 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    for (let flap = 0; flap < 10; flap++) {
      for (const [offset, value] of [
        [0, 28.6],
        [1.5 * MIN, 27.2],
      ] as const) {
        clock = t0 + flap * 3 * MIN + offset
        await store(tank.tankId, tank.deviceId, 'temperature', [[clock, value]])
        await engine.settle()
        await engine.tick(clock)
      }
    }
    const [incident, ...others] = await incidentsOf(tank.tankId)
    expect(others).toHaveLength(0)
    expect(incident.flapCount).toBe(9)
    expect(told.map((x) => x.kind)).toEqual(['opened'])
    expect((await timelineOf(incident.id)).filter((k) => k === 'flapped')).toHaveLength(9)

    // Back once more and holding past the five-minute recheck: that is news again.
    clock = t0 + 31 * MIN
    await store(tank.tankId, tank.deviceId, 'temperature', [[clock, 28.9]])
    await engine.settle()
    await engine.tick(t0 + 35 * MIN)
    expect(told.map((x) => x.kind)).toEqual(['opened'])
    await engine.tick(t0 + 36 * MIN)
    expect(told.map((x) => x.kind)).toEqual(['opened', 'reopened'])
    expect(await incidentsOf(tank.tankId)).toHaveLength(1)
    await engine.stop()
  })

  it('resolving by hand while the condition holds reopens the incident with a note and tells the resolver', async () => {
    const org = await t.createOrg('Reopen Org')
    const tank = await createTankWithDevice(t.ctx, org, 'Reopen tank')
    await addRule(org, tank.tankId, 'pH below 6.5', 'warning', { kind: 'below', metric: 'ph', limit: 6.5, holdMinutes: 0, clearMargin: 0.1 })
    const t0 = Date.now() - 30 * MIN
    const engine = engineAt(t0)
    await engine.start()
    await store(tank.tankId, tank.deviceId, 'ph', [
      [t0, 6.4],
      [t0 + MIN, 6.3],
    ])
    await engine.settle()
    const [incident] = await incidentsOf(tank.tankId)
    const keeper = {
      kind: 'user' as const,
      userId: org.users.keeper.id,
      organizationId: org.organizationId,
      role: 'keeper' as const,
      siteIds: null,
      sessionId: 'x',
    }
    const answer = await incidentsService(t.ctx, recorder, timing).get(keeper, incident.id)
    expect(answer.conditionHolds).toBe(true) // the dialog warns on this
    await incidentsService(t.ctx, recorder, timing).resolveByHand(keeper, incident.id, 'Did a water change')
    await engine.settle()
    await engine.settle()
    await incident.reload()
    expect(incident.state).toBe('open')
    expect(incident.resolvedBy).toBeNull()
    const events = await t.ctx.models.IncidentEvent.findAll({ where: { incidentId: incident.id, kind: 'reopened' } })
    expect(events).toHaveLength(1)
    expect(events[0].detail).toMatchObject({ reason: 'still_holding', resolvedBy: org.users.keeper.id, resolveNote: 'Did a water change' })
    expect(told.filter((x) => x.kind === 'resolver')).toEqual([{ kind: 'resolver', incidentId: incident.id, to: org.users.keeper.id }])
    await engine.stop()
  })

  it('escalation stops at the acknowledgement: the next tick past the escalation time sends nothing (time printed)', async () => {
    const org = await t.createOrg('Ack Org')
    const tank = await createTankWithDevice(t.ctx, org, 'Ack tank')
    await addRule(org, tank.tankId, 'Temperature above 28 °C', 'alarm', { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 0, clearMargin: 0.5 })
    const t0 = Date.now() - 2 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    await store(tank.tankId, tank.deviceId, 'temperature', [[t0, 29.4]])
    await engine.settle()
    const [incident] = await incidentsOf(tank.tankId)
    const started = performance.now()
    const res = await t
      .api()
      .post(`/api/v1/incidents/${incident.id}/acknowledge`)
      .set({ Authorization: `Bearer ${org.users.keeper.token}` })
      .send({ note: 'On it' })
    expect(res.status).toBe(200)
    await engine.tick(t0 + 16 * MIN) // past the 15-minute escalation
    const stoppedMs = performance.now() - started
    console.log(`[alerts] escalation stopped ${stoppedMs.toFixed(0)} ms after the acknowledgement was sent`)
    await incident.reload()
    expect(incident.nextEscalationAt).toBeNull()
    expect(told.filter((x) => x.incidentId === incident.id).map((x) => x.kind)).toEqual(['opened'])
    await engine.stop()
  })
})

describe('site incidents and maintenance windows, with the real mail notifier', () => {
  it('a power cut on ten tanks of one site is one site incident and one mail per person on duty', async () => {
    const org = await t.createOrg('Power Org')
    await onDutyAroundTheClock(org, [org.users.keeper.id, org.users.owner.id])
    const tanks = []
    for (let i = 0; i < 10; i++) {
      const tank = await createTankWithDevice(t.ctx, org, `Row B${i + 1}`)
      await addRule(org, tank.tankId, 'No temperature reading for 15 min', 'warning', { kind: 'quiet', metric: 'temperature', quietMinutes: 15 })
      tanks.push(tank)
    }
    const t0 = Date.now() - 90 * MIN
    const engine = engineAt(t0, createMailNotifier(t.ctx), { siteGroupWaitSeconds: 60 })
    await engine.start()
    for (const tank of tanks)
      await store(
        tank.tankId,
        tank.deviceId,
        'temperature',
        Array.from({ length: 10 }, (_, i) => [t0 + i * MIN + tank.tankId * 1000, 25.5] as [number, number]),
      )
    await engine.settle()
    // The power goes at t0 + 10 min: every node falls silent; quiet rules trip 15 minutes later.
    for (let m = 11; m <= 30; m++) await engine.tick(t0 + m * MIN)
    const incidents = await t.ctx.models.Incident.findAll({ where: { tankId: tanks.map((x) => x.tankId) } })
    expect(incidents).toHaveLength(10)
    const sites = await t.ctx.models.SiteIncident.findAll({ where: { siteId: org.siteIds[0] } })
    expect(sites).toHaveLength(1)
    expect(sites[0].cause).toBe('power')
    expect(incidents.every((i) => i.siteIncidentId === sites[0].id)).toBe(true)
    const mails = await outbox('organization_id = $1', [org.organizationId])
    const byPerson = new Map<string, string[]>()
    for (const m of mails) byPerson.set(m.to_address, [...(byPerson.get(m.to_address) ?? []), m.kind])
    expect([...byPerson.keys()].sort()).toEqual([org.users.keeper.email, org.users.owner.email].sort())
    for (const kinds of byPerson.values()) expect(kinds).toEqual(['site_incident_opened'])
    expect(mails[0].text_body.split('\n')[0]).toMatch(/^First: check the site’s power/)
    expect(mails[0].subject).toBe('Warning: 10 tanks at Power Org shop at once')
    for (let i = 1; i <= 10; i++) expect(mails[0].text_body).toMatch(new RegExp(`^- Row B${i}: no temperature reading for 1[56] min$`, 'm'))
    // The wall shows the one site incident over the ten tiles, each still with its own incident.
    const wall = await t
      .api()
      .get(`/api/v1/sites/${org.siteIds[0]}/wall`)
      .set({ Authorization: `Bearer ${org.users.keeper.token}` })
    expect(wall.status).toBe(200)
    expect(wall.body.siteIncidents).toEqual([
      { id: sites[0].id, title: 'Several tanks cooling or silent at once: a power cut?', severity: 'warning', state: 'open', tanks: 10 },
    ])
    expect(wall.body.tanks.filter((x: { openIncident: { siteIncidentId: number } | null }) => x.openIncident?.siteIncidentId === sites[0].id)).toHaveLength(10)
    await engine.stop()
  })

  it('a maintenance window records without telling anyone, then tells the people on duty within one evaluation of its end', async () => {
    const org = await t.createOrg('Maintenance Org')
    await onDutyAroundTheClock(org, [org.users.keeper.id])
    const tank = await createTankWithDevice(t.ctx, org, 'Service tank')
    await addRule(org, tank.tankId, 'Temperature above 28 °C', 'alarm', { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 0, clearMargin: 0.5 })
    const t0 = Date.now() - 3 * 3600_000
    await t.ctx.models.MaintenanceWindow.create({
      organizationId: org.organizationId,
      siteId: org.siteIds[0],
      tankId: tank.tankId,
      ruleId: null,
      reason: 'Heater swap',
      startsAt: new Date(t0),
      endsAt: new Date(t0 + 30 * MIN),
      weekday: null,
      startMinute: null,
      durationMinutes: null,
      createdBy: org.users.owner.id,
    })
    const engine = engineAt(t0, createMailNotifier(t.ctx))
    await engine.start()
    await store(tank.tankId, tank.deviceId, 'temperature', [[t0 + 5 * MIN, 29.1]])
    await engine.settle()
    const [incident] = await incidentsOf(tank.tankId)
    expect(incident).toMatchObject({ maintenance: true, state: 'open', nextEscalationAt: null })
    for (let m = 6; m < 30; m++) await engine.tick(t0 + m * MIN)
    expect(await outbox('incident_id = $1', [incident.id])).toHaveLength(0)
    await engine.tick(t0 + 30 * MIN) // the first evaluation after the window
    const mails = await outbox('incident_id = $1', [incident.id])
    expect(mails.map((m) => [m.kind, m.to_address])).toEqual([['incident_opened', org.users.keeper.email]])
    expect(mails[0].subject).toBe('Alarm: temperature 29.1 °C, above 28 °C on Service tank · ' + (await t.ctx.models.Site.findByPk(org.siteIds[0]))!.name)
    expect(mails[0].text_body.split('\n')[0]).toBe('First: if the heater is stuck on, switch it off at the socket (dry hands) and check it is fully submerged.')
    expect(mails[0].text_body).toContain('maintenance window, which has ended')
    await incident.reload()
    expect(incident.maintenance).toBe(false)
    await engine.stop()
  })
})
