import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_READINGS_PER_MESSAGE } from '@shared/ingest/contract'
import { bearer, startTestApp } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('HTTP Ingest Org')
  node = await createTankWithDevice(t.ctx, org, 'HTTP tank')
})
afterAll(() => t.close())

const post = (body: unknown, token = node.token) =>
  t
    .api()
    .post('/api/v1/readings')
    .set(bearer(token))
    .send(body as object)
const iso = (msAgo: number) => new Date(Date.now() - msAgo).toISOString()

describe('POST /api/v1/readings', () => {
  it('answers per-reading outcomes and converts units (NIST SP 811: °F→°C, in→cm; IUPAC 2021: NO3-N→NO3)', async () => {
    const time = iso(120_000)
    const res = await post({
      v: 1,
      readings: [
        { metric: 'temperature', value: 77, unit: 'F', time },
        { metric: 'water_level', value: 10, unit: 'in', time },
        { metric: 'nitrate', value: 10, unit: 'mg/L NO3-N', time },
        { metric: 'kh', value: 17.848, unit: 'mg/L CaCO3', time },
      ],
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ accepted: 4, duplicates: 0, rejected: 0 })
    const rows = await t.ctx.sequelize.query<{ metric: string; value: number }>(
      `SELECT metric, value FROM readings WHERE tank_id = $1 AND time = $2 ORDER BY metric`,
      { bind: [node.tankId, time], type: QueryTypes.SELECT },
    )
    const byMetric = Object.fromEntries(rows.map((r) => [r.metric, r.value]))
    expect(byMetric.temperature).toBeCloseTo(25, 9)
    expect(byMetric.water_level).toBeCloseTo(25.4, 9)
    expect(byMetric.nitrate).toBeCloseTo(44.27, 2)
    expect(byMetric.kh).toBeCloseTo(1, 3)
  })

  it('stores a retried batch once and says which readings were duplicates', async () => {
    const body = {
      v: 1,
      readings: [
        { metric: 'ph', value: 7.2, time: iso(90_000) },
        { metric: 'ph', value: 7.25, time: iso(80_000) },
      ],
    }
    expect((await post(body)).body).toMatchObject({ accepted: 2, duplicates: 0 })
    const again = await post({ ...body, readings: [...body.readings, { metric: 'ph', value: 7.3, time: iso(70_000) }] })
    expect(again.body).toMatchObject({ accepted: 1, duplicates: 2, rejected: 0 })
    expect(again.body.results.map((r: { outcome: string }) => r.outcome)).toEqual(['duplicate', 'duplicate', 'accepted'])
  })

  it('treats a duplicate inside one batch as a duplicate', async () => {
    const r = { metric: 'light', value: 5000, time: iso(60_000) }
    const res = await post({ v: 1, readings: [r, r] })
    expect(res.body.results.map((x: { outcome: string }) => x.outcome)).toEqual(['accepted', 'duplicate'])
  })

  it('rejects bad readings with a reason each and keeps the good ones', async () => {
    const res = await post({
      v: 1,
      readings: [
        { metric: 'no_such_metric', value: 1, time: iso(1000) },
        { metric: 'ph', value: 19, time: iso(1000) },
        { metric: 'temperature', value: 25, time: new Date(Date.now() + 3600_000).toISOString() },
        { metric: 'temperature', value: 25, unit: 'kelvin', time: iso(1000) },
        { metric: 'temperature', value: 'warm', time: iso(1000) },
        { metric: 'temperature', value: 25, time: 'yesterday' },
        { metric: 'temperature', value: 25.5, time: iso(1000) },
      ],
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ accepted: 1, rejected: 6 })
    const reasons = res.body.results.filter((r: { outcome: string }) => r.outcome === 'rejected').map((r: { reason: string }) => r.reason)
    expect(reasons[0]).toMatch(/unknown metric "no_such_metric"/)
    expect(reasons[1]).toMatch(/implausible ph 19/)
    expect(reasons[2]).toMatch(/in the future/)
    expect(reasons[3]).toMatch(/kelvin/)
    expect(reasons[4]).toMatch(/value/)
    expect(reasons[5]).toMatch(/time/)
  })

  it('answers 400 for a malformed envelope and an oversized batch, 413 for an oversized body', async () => {
    const noVersion = await post({ readings: [] })
    expect(noVersion.status).toBe(400)
    expect(noVersion.body.error.code).toBe('invalid_message')
    const tooMany = Array.from({ length: MAX_READINGS_PER_MESSAGE + 1 }, (_, i) => ({ metric: 'ph', value: 7, time: iso(i * 1000) }))
    const big = await post({ v: 1, readings: tooMany })
    expect(big.status).toBe(400)
    expect(big.body.error.message).toMatch(/at most 1000/)
    const huge = await post({ v: 1, readings: [{ metric: 'ph', value: 7, time: iso(0), pad: 'x'.repeat(300_000) }] })
    expect(huge.status).toBe(413)
  })

  it('refuses user tokens, unknown tokens and revoked devices with 401', async () => {
    const body = { v: 1, readings: [{ metric: 'ph', value: 7, time: iso(0) }] }
    expect((await post(body, org.users.owner.token)).status).toBe(401)
    expect((await post(body, 'twd_1_notarealsecretnotarealsecret')).status).toBe(401)
    const revoked = await createTankWithDevice(t.ctx, org, 'Revoked HTTP tank')
    await t.ctx.models.Device.update({ revokedAt: new Date() }, { where: { id: revoked.deviceId } })
    expect((await post(body, revoked.token)).status).toBe(401)
  })

  it('lets an owner register a device, shows its token once, rotates and revokes it', async () => {
    const tank = await t.api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send({
      name: 'Device tank',
      siteId: org.siteIds[0],
      kind: 'marine',
      stage: 'established',
      volumeLitres: 300,
    })
    const created = await t
      .api()
      .post('/api/v1/devices')
      .set(bearer(org.users.owner.token))
      .send({
        tankId: tank.body.id,
        name: 'Probe A',
        metrics: ['temperature', 'ph'],
        intervalSeconds: 30,
      })
    expect(created.status).toBe(201)
    expect(created.body.token).toMatch(/^twd_\d+_/)
    // Where the device publishes: this app's host (null) on the embedded broker's configured port.
    expect(created.body.broker).toEqual({ host: null, port: t.ctx.config.mqtt.port })
    const deviceRow = await t.ctx.models.Device.findByPk(created.body.device.id)
    expect(deviceRow!.tokenHash).not.toContain(created.body.token.split('_')[2])
    const list = await t.api().get(`/api/v1/devices?tankId=${tank.body.id}`).set(bearer(org.users.viewer.token))
    expect(list.body[0]).toMatchObject({ name: 'Probe A', quiet: false, readingsToday: 0 })
    expect(list.body[0]).not.toHaveProperty('token')
    expect(list.body[0]).not.toHaveProperty('tokenHash')
    const body = { v: 1, readings: [{ metric: 'temperature', value: 25.4, time: iso(0) }] }
    expect((await post(body, created.body.token)).status).toBe(200)
    const rotated = await t.api().post(`/api/v1/devices/${created.body.device.id}/rotate`).set(bearer(org.users.owner.token))
    expect(rotated.body.broker).toEqual(created.body.broker)
    expect((await post(body, created.body.token)).status).toBe(401)
    expect((await post({ v: 1, readings: [{ metric: 'ph', value: 8.1, time: iso(0) }] }, rotated.body.token)).status).toBe(200)
    const keeperTry = await t.api().post(`/api/v1/devices/${created.body.device.id}/revoke`).set(bearer(org.users.keeper.token))
    expect(keeperTry.status).toBe(403)
    const revoked = await t.api().post(`/api/v1/devices/${created.body.device.id}/revoke`).set(bearer(org.users.owner.token))
    expect(revoked.body.revokedAt).not.toBeNull()
    expect((await post(body, rotated.body.token)).status).toBe(401)
  })
})
