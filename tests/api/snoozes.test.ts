import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { ReadingRow } from '../../server/readings/batch-writer'
import { createRuleEngine } from '../../server/incidents/engine'
import type { IncidentNotifier, NotifyKind } from '../../server/incidents/notifier'
import { incidentsService } from '../../server/incidents/incidents'
import type { PublicSnooze } from '@shared/schemas/rules'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'
import { createTankWithDevice } from '../helpers/fixtures'
import { INSTANT_FORMAT_MESSAGE } from '@shared/schemas/time'

const MIN = 60_000
const HOUR = 60 * MIN
const DAY = 24 * HOUR
const timing = { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }
const STILL_SENT = 'Not heater-line alarms: those are still sent'
const ALSO_HEATER = 'ALSO heater-line alarms: nobody is told if the water falls to the heater top'
const MAILS_ONLY = 'Alert e-mails for this tank’s warnings and alarms (incidents are still recorded and shown on the wall)'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
const told: Array<{ kind: NotifyKind; incidentId: number }> = []
const notifier: IncidentNotifier = {
  notify: async (kind, incident) => {
    told.push({ kind, incidentId: incident.id })
    return ['keeper@example.test']
  },
}

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Snooze Org')
  other = await t.createOrg('Other Snooze Org')
})
afterAll(() => t.close())
beforeEach(() => {
  told.length = 0
})

const as = (role: 'owner' | 'keeper' | 'viewer', of = org) => bearer(of.users[role].token)
const iso = (ms: number) => new Date(ms).toISOString()
async function newTank() {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(as('owner'))
    .send(sampleTank(org.siteIds[0], { name: `Snooze tank ${Math.random()}` }))
  expect(res.status).toBe(201)
  return res.body.id as number
}
const snooze = (tankId: number, body: object, auth = as('keeper')) => t.api().post(`/api/v1/tanks/${tankId}/snoozes`).set(auth).send(body)
const listed = async (tankId: number, auth = as('viewer')) => {
  const res = await t.api().get(`/api/v1/tanks/${tankId}/snoozes`).set(auth)
  expect(res.status).toBe(200)
  return (res.body as PublicSnooze[]).map((s) => s.id)
}
const cancel = (id: number, auth = as('keeper')) => t.api().post(`/api/v1/snoozes/${id}/cancel`).set(auth)
/** One reading of the clock for both ends, so "exactly seven days" stays exact. */
function timeSpan(fromNowMs: number, lengthMs: number) {
  const start = Date.now() + fromNowMs
  return { startsAt: iso(start), endsAt: iso(start + lengthMs) }
}

describe('creating snoozes', () => {
  it('records a snooze and says in words that heater-line alarms are still sent', async () => {
    const tankId = await newTank()
    const span = timeSpan(0, 2 * HOUR)
    const res = await snooze(tankId, { reason: 'Glass cleaning', ...span })
    expect(res.status).toBe(201)
    expect(res.body).toEqual({
      id: expect.any(Number),
      tankId,
      reason: 'Glass cleaning',
      startsAt: span.startsAt,
      endsAt: span.endsAt,
      weekly: false,
      repeatUntil: null,
      includeHeaterLine: false,
      createdBy: org.users.keeper.id,
      cancelledAt: null,
      suppresses: [MAILS_ONLY, STILL_SENT],
    })
    const withHeater = await snooze(tankId, { reason: 'Heater swap', ...span, includeHeaterLine: true }, as('owner'))
    expect([withHeater.status, withHeater.body.includeHeaterLine, withHeater.body.suppresses]).toEqual([201, true, [MAILS_ONLY, ALSO_HEATER]])
  })

  it('repeats weekly up to an end date, and allows exactly seven days', async () => {
    const tankId = await newTank()
    const repeatUntil = iso(Date.now() + 28 * DAY)
    const weekly = await snooze(tankId, { reason: 'Sunday maintenance', ...timeSpan(HOUR, 3 * HOUR), weekly: true, repeatUntil })
    expect([weekly.status, weekly.body.weekly, weekly.body.repeatUntil]).toEqual([201, true, repeatUntil])
    expect((await snooze(tankId, { reason: 'Holiday cover', ...timeSpan(0, 7 * DAY) })).status).toBe(201)
  })

  it.each([
    ['no reason', { ...timeSpan(0, HOUR) }, { reason: 'Invalid input: expected string, received undefined' }],
    ['a reason too short to explain', { reason: 'ok', ...timeSpan(0, HOUR) }, { reason: 'say why' }],
    ['an end before the start', { reason: 'Water change', ...timeSpan(HOUR, -30 * MIN) }, { endsAt: 'must end after it starts' }],
    ['an end equal to the start', { reason: 'Water change', ...timeSpan(HOUR, 0) }, { endsAt: 'must end after it starts' }],
    ['more than seven days', { reason: 'Long holiday', ...timeSpan(0, 7 * DAY + MIN) }, { endsAt: 'at most 7 days at a time' }],
    ['weekly without an end date', { reason: 'Sunday maintenance', ...timeSpan(0, HOUR), weekly: true }, { repeatUntil: 'a weekly snooze needs an end date' }],
    [
      'a time without an offset',
      { reason: 'Water change', startsAt: '2026-03-02T10:00:00', endsAt: '2026-03-02T11:00:00' },
      {
        startsAt: INSTANT_FORMAT_MESSAGE,
        endsAt: INSTANT_FORMAT_MESSAGE,
      },
    ],
  ])('answers 400 with the field for %s', async (_what, body, fields) => {
    const tankId = await newTank()
    const res = await snooze(tankId, body)
    expect([res.status, res.body.error.code, res.body.error.fields]).toEqual([400, 'invalid_input', fields])
    expect(await listed(tankId)).toEqual([])
  })
})

describe('listing and cancelling', () => {
  it('lists snoozes not yet over, in start order, and drops a cancelled one', async () => {
    const tankId = await newTank()
    const later = (await snooze(tankId, { reason: 'Evening feed trial', ...timeSpan(5 * HOUR, HOUR) })).body.id
    const now = (await snooze(tankId, { reason: 'Water change', ...timeSpan(-MIN, HOUR) })).body.id
    const weekly = (await snooze(tankId, { reason: 'Weekly maintenance', ...timeSpan(-2 * DAY, HOUR), weekly: true, repeatUntil: iso(Date.now() + 20 * DAY) }))
      .body.id
    await t.ctx.models.Snooze.create({
      organizationId: org.organizationId,
      tankId,
      reason: 'Yesterday',
      startsAt: new Date(Date.now() - DAY),
      endsAt: new Date(Date.now() - DAY + HOUR),
      createdBy: null,
    })
    expect(await listed(tankId)).toEqual([weekly, now, later])

    const res = await cancel(now)
    expect(res.status).toBe(200)
    expect(Math.abs(Date.parse(res.body.cancelledAt) - Date.now())).toBeLessThan(10_000)
    expect(await listed(tankId)).toEqual([weekly, later])
    // A second cancel keeps the first cancellation time: moving it would re-snooze the minutes in between.
    const again = await cancel(now, as('owner'))
    expect([again.status, again.body.cancelledAt]).toEqual([200, res.body.cancelledAt])
  })
})

describe('who may snooze', () => {
  it('lets owners and keepers snooze and cancel, viewers only look, other organizations nothing', async () => {
    const tankId = await newTank()
    const id = (await snooze(tankId, { reason: 'Water change', ...timeSpan(0, HOUR) }, as('owner'))).body.id as number
    const viewerTries = [await snooze(tankId, { reason: 'Water change', ...timeSpan(0, HOUR) }, as('viewer')), await cancel(id, as('viewer'))]
    expect(viewerTries.map((r) => [r.status, r.body.error.code])).toEqual([
      [403, 'forbidden'],
      [403, 'forbidden'],
    ])
    const stranger = as('owner', other)
    const strangerTries = [
      await t.api().get(`/api/v1/tanks/${tankId}/snoozes`).set(stranger),
      await snooze(tankId, { reason: 'Water change', ...timeSpan(0, HOUR) }, stranger),
      await cancel(id, stranger),
    ]
    expect(strangerTries.map((r) => [r.status, r.body.error.code])).toEqual(Array(3).fill([404, 'not_found']))
    expect(await listed(tankId)).toEqual([id])
    expect((await cancel(id, as('keeper'))).status).toBe(200)
  })
})

describe('snoozes and the heater line, with the engine', () => {
  /** A tank with a device, heater top at 30 cm, and the two heater-line rules new tanks get. */
  async function heaterTank(name: string) {
    const node = await createTankWithDevice(t.ctx, org, name)
    const base = { organizationId: org.organizationId, siteId: org.siteIds[0], tankId: node.tankId }
    const warning = await t.ctx.models.WatchRule.create({
      ...base,
      name: 'Water level within 2 cm of the heater top',
      severity: 'warning',
      spec: { kind: 'heater_line', marginCm: 2, holdMinutes: 0, clearMargin: 0.5 },
    })
    const alarm = await t.ctx.models.WatchRule.create({
      ...base,
      name: 'Water level at or below the heater top',
      severity: 'alarm',
      spec: { kind: 'heater_line', marginCm: 0, holdMinutes: 0, clearMargin: 0.5 },
    })
    return { ...node, warningId: warning.id, alarmId: alarm.id }
  }

  /** Snoozes the tank over t0, lets the engine see the water fall below the heater top, and says who was told. */
  async function dropWaterDuringSnooze(includeHeaterLine: boolean) {
    const tank = await heaterTank(`Heater tank ${includeHeaterLine ? 'with' : 'without'} heater line`)
    const t0 = Date.now() - 30 * MIN
    const res = await snooze(tank.tankId, { reason: 'Topping up after a water change', startsAt: iso(t0 - MIN), endsAt: iso(t0 + HOUR), includeHeaterLine })
    expect(res.status).toBe(201)
    let clock = t0
    const engine = createRuleEngine(t.ctx, incidentsService(t.ctx, notifier, timing), { now: () => clock })
    await engine.start()
    const rows: ReadingRow[] = [
      [t0, 45],
      [t0 + MIN, 29.5],
    ].map(([at, value]) => ({
      sourceKey: `d:${tank.deviceId}`,
      metric: 'water_level',
      time: new Date(at),
      tankId: tank.tankId,
      value,
      source: 'device',
    }))
    await t.ctx.readings.writer.write(rows)
    await engine.settle()
    clock = t0 + 2 * MIN
    await engine.tick()
    await engine.stop()
    const incidents = await t.ctx.models.Incident.findAll({ where: { tankId: tank.tankId }, order: [['id', 'ASC']] })
    const byRule = (ruleId: number) => incidents.find((i) => i.ruleId === ruleId)!
    const toldAbout = (ruleId: number) => told.filter((x) => x.incidentId === byRule(ruleId).id).map((x) => x.kind)
    return { incidents, warning: byRule(tank.warningId), toldAbout, tank }
  }

  it('still sends the heater-line alarm during a snooze without includeHeaterLine', async () => {
    // Warning and alarm levels are one incident (a ladder): the snoozed warning rises to an alarm that is not snoozed.
    const { incidents, warning, toldAbout, tank } = await dropWaterDuringSnooze(false)
    expect(incidents).toHaveLength(1)
    expect([warning.state, warning.severity, warning.snoozed, warning.firstValue]).toEqual(['open', 'alarm', false, 29.5])
    expect(toldAbout(tank.warningId)).toEqual(['opened'])
  })

  it('silences the heater-line alarm too when the snooze includes the heater line', async () => {
    const { incidents, warning, toldAbout, tank } = await dropWaterDuringSnooze(true)
    expect(incidents).toHaveLength(1)
    expect([warning.state, warning.severity, warning.snoozed]).toEqual(['open', 'alarm', true])
    expect(toldAbout(tank.warningId)).toEqual([])
  })
})
