import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ReadingRow } from '../../server/readings/batch-writer'
import { createRuleEngine, type RuleEngine } from '../../server/incidents/engine'
import type { IncidentNotifier } from '../../server/incidents/notifier'
import { incidentsService } from '../../server/incidents/incidents'
import { bearer, sampleTank, startTestApp } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'

const MIN = 60_000
const timing = { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }
const notifier: IncidentNotifier = { notify: async () => ['keeper@example.test'] }

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let clock = 0

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Sensor Trust Org')
})
afterAll(() => t.close())

function engineAt(start: number): RuleEngine {
  clock = start
  return createRuleEngine(t.ctx, incidentsService(t.ctx, notifier, timing), { now: () => clock })
}

/** A tank and a probe made through the API, so the probe brings its rules. */
async function tankWithProbe(name: string, metrics: string[] = ['temperature', 'ph']) {
  const owner = bearer(org.users.owner.token)
  const tank = await t.api().post('/api/v1/tanks').set(owner).send(sampleTank(org.siteIds[0], { name }))
  expect(tank.status).toBe(201)
  const device = await t
    .api()
    .post('/api/v1/devices')
    .set(owner)
    .send({ tankId: tank.body.id, name: `${name} probe`, metrics, intervalSeconds: 300 })
  expect(device.status).toBe(201)
  return { tankId: tank.body.id as number, deviceId: device.body.device.id as number }
}

async function store(tankId: number, deviceId: number, metric: string, points: Array<[number, number]>) {
  const rows: ReadingRow[] = points.map(([at, value]) => ({ sourceKey: `d:${deviceId}`, metric, time: new Date(at), tankId, value, source: 'device' }))
  await t.ctx.readings.writer.write(rows)
}

const incidentsOf = (tankId: number) => t.ctx.models.Incident.findAll({ where: { tankId }, order: [['id', 'ASC']] })

describe('a probe that disagrees with the test kit', () => {
  it('opens a watch with both values when a kit entry differs from the probe by more than the tolerance, and the entry says so at once', async () => {
    const tank = await tankWithProbe('Kit check tank')
    const rules = await t.api().get(`/api/v1/tanks/${tank.tankId}/rules`).set(bearer(org.users.viewer.token))
    const kitRule = rules.body.find((r: { spec: { kind: string; metric?: string } }) => r.spec.kind === 'probe_kit' && r.spec.metric === 'ph')
    // pH 0.2 (`common practice`)
    expect(kitRule).toMatchObject({ severity: 'warning', spec: { tolerance: 0.2 } })

    const t0 = Date.now() - 40 * MIN
    const engine = engineAt(t0)
    await engine.start()
    await store(tank.tankId, tank.deviceId, 'ph', [
      [t0, 7.42],
      [t0 + 5 * MIN, 7.45],
      [t0 + 10 * MIN, 7.44],
    ])
    await engine.settle()
    clock = t0 + 11 * MIN
    // Within 0.2 of the probe: agreement, no watch.
    const agree = await t
      .api()
      .post(`/api/v1/tanks/${tank.tankId}/test-kit-entries`)
      .set(bearer(org.users.keeper.token))
      .send({ takenAt: new Date(t0 + 5 * MIN).toISOString(), values: [{ metric: 'ph', value: 7.3, unit: 'pH' }], notes: '' })
    expect(agree.status).toBe(201)
    expect(agree.body.probeChecks).toEqual([expect.objectContaining({ metric: 'ph', kit: 7.3, probe: 7.45, disagrees: false })])
    await engine.settle()
    expect(await incidentsOf(tank.tankId)).toHaveLength(0)

    const entry = await t
      .api()
      .post(`/api/v1/tanks/${tank.tankId}/test-kit-entries`)
      .set(bearer(org.users.keeper.token))
      .send({ takenAt: new Date(t0 + 10 * MIN).toISOString(), values: [{ metric: 'ph', value: 7.1, unit: 'pH' }], notes: '' })
    expect(entry.status).toBe(201)
    const [check] = entry.body.probeChecks
    expect(check).toMatchObject({ metric: 'ph', kit: 7.1, probe: 7.44, disagrees: true, limit: 0.2 })
    expect(check.difference).toBeCloseTo(0.34, 9)
    await engine.settle()
    const [watch] = (await incidentsOf(tank.tankId)).filter((i) => i.ruleKind === 'probe_kit')
    expect(watch).toMatchObject({ ruleKind: 'probe_kit', metric: 'ph', severity: 'warning', state: 'open', title: 'pH probe disagrees with the test kit' })
    expect(watch.firstValue).toBeCloseTo(0.34, 9)
    const opened = await t.ctx.models.IncidentEvent.findOne({ where: { incidentId: watch.id, kind: 'opened' } })
    expect(opened!.detail).toMatchObject({ kit: 7.1, probe: 7.44 })
    await engine.stop()
  })
})

describe('a probe that stands still', () => {
  it('opens a watch once a moving probe has not moved past its noise floor for three hours (injected clock)', async () => {
    const tank = await tankWithProbe('Frozen probe tank', ['temperature'])
    const t0 = Date.now() - 6 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    // An hour of a living tank, then the same value to the hundredth for four hours.
    const moving: Array<[number, number]> = Array.from({ length: 12 }, (_, i) => [t0 + i * 5 * MIN, 25 + 0.1 * Math.sin(i)])
    await store(tank.tankId, tank.deviceId, 'temperature', moving)
    const frozenFrom = t0 + 60 * MIN
    const frozen: Array<[number, number]> = Array.from({ length: 49 }, (_, i) => [frozenFrom + i * 5 * MIN, 25.04])
    await store(tank.tankId, tank.deviceId, 'temperature', frozen.slice(0, 35)) // 2 h 50 min still
    await engine.settle()
    clock = frozenFrom + 170 * MIN
    await engine.tick()
    expect((await incidentsOf(tank.tankId)).filter((i) => i.ruleKind === 'stuck')).toHaveLength(0)

    await store(tank.tankId, tank.deviceId, 'temperature', frozen.slice(35))
    await engine.settle()
    const stuck = (await incidentsOf(tank.tankId)).filter((i) => i.ruleKind === 'stuck')
    expect(stuck).toHaveLength(1)
    expect(stuck[0].title).toBe('Temperature probe may be frozen or out of the water')
    expect(stuck[0].openedAt.getTime()).toBe(frozenFrom + 180 * MIN)
    expect(stuck[0].conditionSince.getTime()).toBe(frozenFrom)

    // It moves again: the watch clears.
    await store(tank.tankId, tank.deviceId, 'temperature', [[frozenFrom + 250 * MIN, 25.3]])
    await engine.settle()
    const [after] = (await incidentsOf(tank.tankId)).filter((i) => i.ruleKind === 'stuck')
    expect(after.state).toBe('resolved')
    await engine.stop()
  })
})

describe('a spike', () => {
  it('does not trip a rule by itself, while a real step trips at the time it happened', async () => {
    const tank = await tankWithProbe('Spiky tank', ['temperature'])
    const rule = await t.ctx.models.WatchRule.create({
      organizationId: org.organizationId,
      siteId: org.siteIds[0],
      tankId: tank.tankId,
      name: 'Temperature above 28 °C',
      severity: 'alarm',
      spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 0, clearMargin: 0.5 },
    })
    const t0 = Date.now() - 2 * 3600_000
    const engine = engineAt(t0)
    await engine.start()
    await store(tank.tankId, tank.deviceId, 'temperature', [
      [t0, 26],
      [t0 + 5 * MIN, 26.1],
      [t0 + 10 * MIN, 34], // a single reading far from both neighbours
      [t0 + 15 * MIN, 26.1],
      [t0 + 20 * MIN, 26],
    ])
    await engine.settle()
    expect(await t.ctx.models.Incident.count({ where: { ruleId: rule.id } })).toBe(0)

    // The chart marks it.
    const series = await t
      .api()
      .get(`/api/v1/tanks/${tank.tankId}/series`)
      .query({ metric: 'temperature', from: new Date(t0 - MIN).toISOString(), to: new Date(t0 + 21 * MIN).toISOString() })
      .set(bearer(org.users.viewer.token))
    expect(series.body.raw.map((r: { spike?: boolean }) => r.spike ?? false)).toEqual([false, false, true, false, false])

    // A step that stays: the rule trips, dated at the first reading of the step.
    await store(tank.tankId, tank.deviceId, 'temperature', [
      [t0 + 25 * MIN, 31],
      [t0 + 30 * MIN, 31.2],
    ])
    await engine.settle()
    const [step] = await t.ctx.models.Incident.findAll({ where: { ruleId: rule.id } })
    expect(step.openedAt.getTime()).toBe(t0 + 25 * MIN)
    expect(step.firstValue).toBe(31)
    await engine.stop()
  })
})
