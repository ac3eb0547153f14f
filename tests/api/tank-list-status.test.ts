import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TankListItem } from '@shared/schemas/tanks'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'
import { createIncidentRow } from '../helpers/fixtures'

// The tanks list carries each tank's state as the wall computes it (shared/tank-state.ts):
// an alarm incident wins, then a silent device, then a warning or a value near or past its band.
// Bands are the starter targets of a tropical freshwater tank: 24–28 °C, pH 6.5–7.5.

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
const MINUTE_MS = 60_000

async function tank(name: string, overrides: Record<string, unknown> = {}) {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(bearer(org.users.keeper.token))
    .send(sampleTank(org.siteIds[0], { name, ...overrides }))
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.id as number
}

async function device(tankId: number, name: string, lastSeenAt: Date) {
  await t.ctx.models.Device.create({
    organizationId: org.organizationId,
    tankId,
    name,
    metrics: ['temperature', 'ph'],
    intervalSeconds: 60,
    tokenHash: `unused-${name}`,
    lastSeenAt,
  })
}

async function reading(tankId: number, metric: string, value: number, at: Date) {
  await t.ctx.sequelize.query(`INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ($1, $2, $3, $4, $5, 'test_kit')`, {
    bind: [`k:${tankId}-${metric}-${at.getTime()}`, metric, at, tankId, value],
  })
}

async function incident(tankId: number, severity: 'warning' | 'alarm', title: string, state = 'open') {
  const row = await createIncidentRow(t.ctx, org, tankId, { severity, title, state: state as never, firstValue: 28.4, peakValue: 28.4, latestValue: 28.4 })
  return row.id
}

const ids: Record<string, number> = {}
const readAt = new Date(Date.now() - 3 * MINUTE_MS)

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('List Status Org')
  ids.steady = await tank('Steady tank')
  ids.watch = await tank('Watch tank')
  ids.alarm = await tank('Alarm tank')
  ids.quiet = await tank('Quiet tank')
  ids.empty = await tank('Empty tank', { stage: 'empty' })
  for (const name of ['steady', 'watch', 'alarm']) await device(ids[name]!, `${name} probe`, new Date())
  await device(ids.quiet!, 'quiet probe', new Date(Date.now() - 60 * MINUTE_MS))
  await device(ids.empty!, 'empty probe', new Date(Date.now() - 60 * MINUTE_MS))
  await reading(ids.steady!, 'temperature', 25.9, readAt)
  await reading(ids.steady!, 'ph', 7.0, readAt)
  await reading(ids.watch!, 'temperature', 27.8, readAt)
  await reading(ids.alarm!, 'temperature', 26, readAt)
  await incident(ids.alarm!, 'alarm', 'Temperature above 28 °C for 10 min')
  await incident(ids.alarm!, 'warning', 'pH below 6.6 for 30 min', 'acknowledged')
  await incident(ids.alarm!, 'warning', 'An old one', 'resolved')
})
afterAll(() => t.close())

async function listed() {
  const res = await t.api().get('/api/v1/tanks?pageSize=50').set(bearer(org.users.viewer.token))
  expect(res.status).toBe(200)
  return new Map((res.body.items as TankListItem[]).map((item) => [item.name, item]))
}

describe('GET /tanks: each row says how the tank is now', () => {
  it('gives the wall state of each tank', async () => {
    const rows = await listed()
    expect(Object.fromEntries([...rows].map(([name, row]) => [name, row.status.state]))).toEqual({
      'Steady tank': 'steady',
      'Watch tank': 'watch',
      'Alarm tank': 'alarm',
      'Quiet tank': 'quiet',
      'Empty tank': 'steady',
    })
    // 27.8 °C is within a tenth of the 24–28 °C band's width of its top.
    expect(rows.get('Watch tank')!.status.stateReasons).toEqual(['temperature 27.8 near the edge of 24–28'])
    expect(rows.get('Quiet tank')!.status).toMatchObject({ quietDevices: ['quiet probe'], hasDevices: true, stateReasons: ['quiet probe has not reported'] })
    // Nobody waits for readings from an empty tank, so its silent device does not make it quiet.
    expect(rows.get('Empty tank')!.status.quietDevices).toEqual([])
  })

  it('gives the latest values with their times', async () => {
    const steady = (await listed()).get('Steady tank')!
    expect(steady.status.latest.temperature).toMatchObject({ value: 25.9, time: readAt.toISOString(), source: 'test_kit' })
    expect(steady.status.latest.ph).toMatchObject({ value: 7, time: readAt.toISOString() })
    expect(steady.status.openIncidents).toEqual([])
  })

  it('lists open and acknowledged incidents, not resolved ones', async () => {
    const alarm = (await listed()).get('Alarm tank')!
    expect(alarm.status.openIncidents.map((i) => [i.severity, i.title]).sort()).toEqual([
      ['alarm', 'Temperature above 28 °C for 10 min'],
      ['warning', 'pH below 6.6 for 30 min'],
    ])
    expect(alarm.status.stateReasons).toEqual(['Temperature above 28 °C for 10 min'])
  })
})
