import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { ReadingRow } from '../../server/readings/batch-writer'
import type { Incident } from '../../server/models'
import { createRuleEngine, type RuleEngine } from '../../server/incidents/engine'
import type { IncidentNotifier, NotifyKind } from '../../server/incidents/notifier'
import { incidentsService } from '../../server/incidents/incidents'
import { startTestApp } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'

const MIN = 60_000
const timing = { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let clock = 0
const told: Array<{ kind: NotifyKind; incidentId: number }> = []
const notifier: IncidentNotifier = {
  notify: async (kind, incident) => {
    told.push({ kind, incidentId: incident.id })
    return ['keeper@example.test']
  },
}

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Engine Org')
})
afterAll(() => t.close())
beforeEach(() => {
  told.length = 0
})

function engineAt(start: number): RuleEngine {
  clock = start
  return createRuleEngine(t.ctx, incidentsService(t.ctx, notifier, timing), { now: () => clock })
}

/** A tank with one "temperature above 28 °C for 10 min, clears below 27.5" alarm rule. */
async function tankWithHeatRule(name: string) {
  const node = await createTankWithDevice(t.ctx, org, name)
  const rule = await t.ctx.models.WatchRule.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0],
    tankId: node.tankId,
    name: 'Temperature above 28 °C for 10 min',
    severity: 'alarm',
    spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
  })
  return { ...node, ruleId: rule.id }
}

async function store(tankId: number, deviceId: number, points: Array<[number, number]>) {
  const rows: ReadingRow[] = points.map(([at, value]) => ({
    sourceKey: `d:${deviceId}`,
    metric: 'temperature',
    time: new Date(at),
    tankId,
    value,
    source: 'device',
  }))
  await t.ctx.readings.writer.write(rows)
}

const incidentsOf = (tankId: number) => t.ctx.models.Incident.findAll({ where: { tankId }, order: [['id', 'ASC']] }) as Promise<Incident[]>

describe('the watch-rule engine over real PostgreSQL', () => {
  it('opens one incident when the hold ends, updates it on repeats, and resolves it below the clear margin', async () => {
    const tank = await tankWithHeatRule('Hold tank')
    const t0 = Date.now() - 3 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 9 }, (_, i) => [t0 + i * MIN, 28.6] as [number, number]),
    )
    await engine.settle()
    clock = t0 + 9 * MIN
    await engine.tick()
    expect(await incidentsOf(tank.tankId)).toHaveLength(0) // held 9 minutes: not yet

    await store(tank.tankId, tank.deviceId, [
      [t0 + 10 * MIN, 28.9],
      [t0 + 11 * MIN, 29.4],
      [t0 + 12 * MIN, 27.8],
    ])
    await engine.settle()
    const open = await incidentsOf(tank.tankId)
    expect(open).toHaveLength(1)
    expect(open[0].openedAt.getTime()).toBe(t0 + 10 * MIN)
    expect(open[0].conditionSince.getTime()).toBe(t0)
    expect(open[0].state).toBe('open')
    expect(told).toEqual([{ kind: 'opened', incidentId: open[0].id }])

    // 27.8 is under the limit but inside the clear margin: the incident stays open (no flapping).
    await store(tank.tankId, tank.deviceId, [
      [t0 + 13 * MIN, 28.2],
      [t0 + 14 * MIN, 27.4],
    ])
    await engine.settle()
    const [resolved] = await incidentsOf(tank.tankId)
    expect(resolved.state).toBe('resolved')
    expect(resolved.resolvedAt!.getTime()).toBe(t0 + 14 * MIN)
    expect(resolved.resolvedBy).toBeNull()
    // The all-clear waits out the rule's 30-minute settle window, in case the condition comes back.
    expect(told.map((x) => x.kind)).toEqual(['opened'])
    await engine.tick(t0 + 43 * MIN)
    expect(told.map((x) => x.kind)).toEqual(['opened'])
    await engine.tick(t0 + 44 * MIN)
    expect(told.map((x) => x.kind)).toEqual(['opened', 'resolved'])
    expect(await incidentsOf(tank.tankId)).toHaveLength(1)
    await engine.stop()
  })

  it('survives a restart mid-hold: the incident opens at the right time, once', async () => {
    const tank = await tankWithHeatRule('Restart tank')
    const t0 = Date.now() - 2 * 3600_000
    const first = engineAt(t0)
    await first.start()
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 6 }, (_, i) => [t0 + i * MIN, 28.5] as [number, number]),
    )
    await first.settle()
    await first.stop()

    const second = engineAt(t0 + 6 * MIN)
    await second.start()
    expect(second.stateOf(tank.ruleId, tank.tankId)).toMatchObject({ status: 'holding', since: t0 })
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 6 }, (_, i) => [t0 + (6 + i) * MIN, 28.7] as [number, number]),
    )
    await second.settle()
    const incidents = await incidentsOf(tank.tankId)
    expect(incidents).toHaveLength(1)
    expect(incidents[0].openedAt.getTime()).toBe(t0 + 10 * MIN)

    // A third start finds the open incident and opens no duplicate.
    await second.stop()
    const third = engineAt(t0 + 13 * MIN)
    await third.start()
    await third.tick()
    expect(await incidentsOf(tank.tankId)).toHaveLength(1)
    expect(third.stateOf(tank.ruleId, tank.tankId).status).toBe('tripped')
    await third.stop()
  })

  it('opens an incident that tripped while the engine was stopped, at its trip time', async () => {
    const tank = await tankWithHeatRule('Downtime tank')
    const t0 = Date.now() - 3600_000
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 13 }, (_, i) => [t0 + i * MIN, 29] as [number, number]),
    )
    const engine = engineAt(t0 + 14 * MIN)
    await engine.start()
    const incidents = await incidentsOf(tank.tankId)
    expect(incidents).toHaveLength(1)
    expect(incidents[0].openedAt.getTime()).toBe(t0 + 10 * MIN)
    await engine.stop()
  })

  it('escalates an unacknowledged alarm after 15 minutes, repeats, and stops at once when acknowledged', async () => {
    const tank = await tankWithHeatRule('Escalation tank')
    const t0 = Date.now() - 4 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 12 }, (_, i) => [t0 + i * MIN, 29.5] as [number, number]),
    )
    await engine.settle()
    const [incident] = await incidentsOf(tank.tankId)
    expect(incident.nextEscalationAt!.getTime()).toBe(t0 + 25 * MIN)

    const mine = () => told.filter((x) => x.incidentId === incident.id).map((x) => x.kind)
    await engine.tick(t0 + 24 * MIN)
    expect(mine()).toEqual(['opened'])
    await engine.tick(t0 + 25 * MIN)
    expect(mine()).toEqual(['opened', 'escalated'])
    await engine.tick(t0 + 55 * MIN)
    expect(mine()).toEqual(['opened', 'escalated', 'repeated'])

    const keeper = {
      kind: 'user' as const,
      userId: org.users.keeper.id,
      organizationId: org.organizationId,
      role: 'keeper' as const,
      siteIds: null,
      sessionId: 'x',
    }
    await incidentsService(t.ctx, notifier, timing).acknowledge(keeper, incident.id, 'Heater unplugged, fan on')
    await engine.tick(t0 + 90 * MIN)
    await engine.tick(t0 + 200 * MIN)
    expect(mine()).toEqual(['opened', 'escalated', 'repeated'])
    const after = (await incidentsOf(tank.tankId))[0]
    expect(after).toMatchObject({
      state: 'acknowledged',
      acknowledgedBy: org.users.keeper.id,
      acknowledgeNote: 'Heater unplugged, fan on',
      nextEscalationAt: null,
      nextRepeatAt: null,
    })
    // Across a restart too: the stopped timers are columns, so a new engine sends nothing more.
    await engine.stop()
    const restarted = engineAt(t0 + 210 * MIN)
    await restarted.start()
    await restarted.tick(t0 + 400 * MIN)
    expect(mine()).toEqual(['opened', 'escalated', 'repeated'])
    await restarted.stop()
    await engine.start()
    const kinds = (await t.ctx.models.IncidentEvent.findAll({ where: { incidentId: incident.id }, order: [['id', 'ASC']] })).map((e) => e.kind)
    expect(kinds).toEqual(['opened', 'mail_queued', 'escalated', 'mail_queued', 'repeated', 'mail_queued', 'acknowledged'])
    await engine.stop()
  })

  it('records but does not notify while the tank is snoozed', async () => {
    const tank = await tankWithHeatRule('Snoozed tank')
    const t0 = Date.now() - 5 * 3600_000
    await t.ctx.models.Snooze.create({
      organizationId: org.organizationId,
      tankId: tank.tankId,
      reason: 'Glass cleaning',
      startsAt: new Date(t0 - MIN),
      endsAt: new Date(t0 + 60 * MIN),
      createdBy: org.users.keeper.id,
    })
    const engine = engineAt(t0)
    await engine.start()
    await store(
      tank.tankId,
      tank.deviceId,
      Array.from({ length: 12 }, (_, i) => [t0 + i * MIN, 29] as [number, number]),
    )
    await engine.settle()
    const [incident] = await incidentsOf(tank.tankId)
    expect(incident.snoozed).toBe(true)
    expect(told.filter((x) => x.incidentId === incident.id)).toEqual([])
    await engine.stop()
  })
})
