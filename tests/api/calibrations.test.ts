import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, startTestApp } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Calibration Org')
})
afterAll(() => t.close())

const iso = (msAgo: number) => new Date(Date.now() - msAgo).toISOString()
const sendPh = (token: string, value: number, time: string) =>
  t
    .api()
    .post('/api/v1/readings')
    .set(bearer(token))
    .send({ v: 1, readings: [{ metric: 'ph', value, time }] })
const calibrate = (deviceId: number, body: object, token = org.users.keeper.token) =>
  t.api().post(`/api/v1/devices/${deviceId}/calibrations`).set(bearer(token)).send(body)
const stored = (tankId: number) =>
  t.ctx.sequelize.query<{ value: number; raw_value: number | null; calibration_id: number | null }>(
    'SELECT value, raw_value, calibration_id FROM readings WHERE tank_id = $1 AND metric = $2 ORDER BY time',
    { bind: [tankId, 'ph'], type: QueryTypes.SELECT },
  )

// A probe reading 7.10 in the pH 7.00 buffer and 4.20 in the pH 4.01 buffer: two-point method
// (IUPAC Recommendations 2002, Measurement of pH, Buck et al., Pure Appl. Chem. 74(11)).
const TWO_POINT = {
  metric: 'ph',
  points: [
    { buffer: 7.0, temperatureC: 25, reading: 7.1 },
    { buffer: 4.01, temperatureC: 25, reading: 4.2 },
  ],
}

describe('pH calibration', () => {
  it('records the slope and offset, corrects readings from then on, and leaves earlier ones as they were', async () => {
    const node = await createTankWithDevice(t.ctx, org, 'Calibrated tank')
    expect((await sendPh(node.token, 7.1, iso(120_000))).body).toMatchObject({ accepted: 1 })

    const res = await calibrate(node.deviceId, TWO_POINT)
    expect(res.status).toBe(201)
    // 2.90 pH of response over 2.99 pH of buffers: 97.0 % of the ideal slope, reading 0.10 high at pH 7.
    expect(res.body.slopePercent).toBeCloseTo(96.99, 2)
    expect(res.body.slopeOk).toBe(true)
    expect(res.body.performedBy).toMatchObject({ id: org.users.keeper.id })

    expect((await sendPh(node.token, 7.1, iso(60_000))).body).toMatchObject({ accepted: 1 })
    const rows = await stored(node.tankId)
    expect(rows).toHaveLength(2)
    expect(rows[0]).toEqual({ value: 7.1, raw_value: null, calibration_id: null })
    expect(rows[1].value).toBeCloseTo(7.0, 9)
    expect(rows[1].raw_value).toBe(7.1)
    expect(rows[1].calibration_id).toBe(res.body.id)

    const series = (values: string) =>
      t
        .api()
        .get(`/api/v1/tanks/${node.tankId}/series`)
        .query({ metric: 'ph', from: iso(600_000), values })
        .set(bearer(org.users.viewer.token))
    const corrected = await series('corrected')
    expect(corrected.status).toBe(200)
    expect(corrected.body.raw.map((r: { value: number }) => Number(r.value.toFixed(3)))).toEqual([7.1, 7.0])
    expect(corrected.body.raw[1].calibrated).toBe(true)
    const raw = await series('raw')
    expect(raw.body.raw.map((r: { value: number }) => r.value)).toEqual([7.1, 7.1])
    expect((await series('smoothed')).status).toBe(400)

    const list = await t.api().get(`/api/v1/devices/${node.deviceId}/calibrations`).set(bearer(org.users.viewer.token))
    expect(list.status).toBe(200)
    expect(list.body).toHaveLength(1)
    expect(list.body[0]).toMatchObject({ metric: 'ph', method: 'ph_buffers', slopeOk: true })
  })

  it('a newer calibration takes over at once (the cache is refreshed), without rewriting what was stored', async () => {
    const node = await createTankWithDevice(t.ctx, org, 'Recalibrated tank')
    await calibrate(node.deviceId, TWO_POINT)
    await sendPh(node.token, 7.1, iso(90_000))
    const ideal = await calibrate(node.deviceId, {
      metric: 'ph',
      points: [
        { buffer: 7, temperatureC: 25, reading: 7 },
        { buffer: 4, temperatureC: 25, reading: 4 },
      ],
    })
    await sendPh(node.token, 7.1, iso(30_000))
    const rows = await stored(node.tankId)
    expect(rows[0].value).toBeCloseTo(7.0, 9)
    expect(rows[1]).toMatchObject({ raw_value: 7.1, calibration_id: ideal.body.id })
    expect(rows[1].value).toBeCloseTo(7.1, 9)
  })

  it('flags a tired probe; refuses bad input with the field, a viewer, and a metric the device does not report', async () => {
    const node = await createTankWithDevice(t.ctx, org, 'Tired probe tank')
    const tired = await calibrate(node.deviceId, {
      metric: 'ph',
      points: [
        { buffer: 7, temperatureC: 25, millivolts: 0 },
        { buffer: 4, temperatureC: 25, millivolts: 150 },
      ],
    })
    expect(tired.status).toBe(201)
    expect(tired.body.slopeOk).toBe(false)
    expect(tired.body.slopePercent).toBeCloseTo(84.5, 1)

    const one = await calibrate(node.deviceId, { metric: 'ph', points: [{ buffer: 7, temperatureC: 25, reading: 7 }] })
    expect(one.status).toBe(400)
    expect(one.body.error.fields).toHaveProperty('points')
    const flat = await calibrate(node.deviceId, {
      metric: 'ph',
      points: [
        { buffer: 7, temperatureC: 25, reading: 7 },
        { buffer: 4, temperatureC: 25, reading: 7 },
      ],
    })
    expect(flat.status).toBe(400)
    expect(flat.body.error.fields).toHaveProperty('points')
    expect((await calibrate(node.deviceId, TWO_POINT, org.users.viewer.token)).status).toBe(403)
    const conductivity = await calibrate(node.deviceId, { metric: 'conductivity', standard: 1413, reading: 1350 })
    expect(conductivity.status).toBe(400)
    expect(conductivity.body.error.fields).toHaveProperty('metric')
    expect((await calibrate(999999, TWO_POINT)).status).toBe(404)
  })

  it('a device that calibrates itself is left alone', async () => {
    const node = await createTankWithDevice(t.ctx, org, 'Self-calibrating tank')
    await calibrate(node.deviceId, { metric: 'temperature', referenceC: 25.5, reading: 25 })
    const patch = await t.api().patch(`/api/v1/devices/${node.deviceId}`).set(bearer(org.users.owner.token)).send({ selfCalibrating: true })
    expect(patch.status).toBe(200)
    expect(patch.body.selfCalibrating).toBe(true)
    await t
      .api()
      .post('/api/v1/readings')
      .set(bearer(node.token))
      .send({ v: 1, readings: [{ metric: 'temperature', value: 25, time: iso(10_000) }] })
    const [row] = await t.ctx.sequelize.query<{ value: number; raw_value: number | null }>(
      'SELECT value, raw_value FROM readings WHERE tank_id = $1 AND metric = $2',
      { bind: [node.tankId, 'temperature'], type: QueryTypes.SELECT },
    )
    expect(row).toEqual({ value: 25, raw_value: null })
  })

  it('a pH probe brings a four-weekly care task, which recording its calibration ticks off', async () => {
    const owner = bearer(org.users.owner.token)
    const tank = await t
      .api()
      .post('/api/v1/tanks')
      .set(owner)
      .send(sampleTank(org.siteIds[0], { name: 'Care probe tank' }))
    const device = await t
      .api()
      .post('/api/v1/devices')
      .set(owner)
      .send({ tankId: tank.body.id, name: 'Dosing node', metrics: ['ph'], intervalSeconds: 60 })
    expect(device.status).toBe(201)
    const tasks = async () =>
      (await t.api().get(`/api/v1/tanks/${tank.body.id}/care-tasks`).set(owner)).body as Array<{
        title: string
        recurrence: unknown
        lastDoneAt: string | null
      }>
    const before = (await tasks()).find((task) => task.title === 'Calibrate the pH probe (Dosing node)')
    // Every four weeks (`common practice`).
    expect(before).toMatchObject({ recurrence: { kind: 'interval', everyDays: 28 }, lastDoneAt: null })
    const saved = await calibrate(device.body.device.id, TWO_POINT)
    expect(saved.status).toBe(201)
    const after = (await tasks()).find((task) => task.title === 'Calibrate the pH probe (Dosing node)')
    expect(after!.lastDoneAt).toBe(saved.body.performedAt)
  })

  it('a pH probe that calibrates itself brings no calibration task', async () => {
    const owner = bearer(org.users.owner.token)
    const tank = await t
      .api()
      .post('/api/v1/tanks')
      .set(owner)
      .send(sampleTank(org.siteIds[0], { name: 'Self-calibrating tank' }))
    const device = await t
      .api()
      .post('/api/v1/devices')
      .set(owner)
      .send({ tankId: tank.body.id, name: 'Smart node', metrics: ['ph'], intervalSeconds: 60, selfCalibrating: true })
    expect(device.status).toBe(201)
    expect(device.body.device.selfCalibrating).toBe(true)
    const tasks = (await t.api().get(`/api/v1/tanks/${tank.body.id}/care-tasks`).set(owner)).body as Array<{ title: string }>
    expect(tasks.map((task) => task.title)).not.toContain('Calibrate the pH probe (Smart node)')
    expect(tasks.length).toBeGreaterThan(0)
  })
})
