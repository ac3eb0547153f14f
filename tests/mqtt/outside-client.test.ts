import { execFile } from 'node:child_process'
import { promisify } from 'node:util'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readingsTopic } from '@shared/ingest/contract'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

const run = promisify(execFile)
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let other: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Mosquitto Org')
  node = await createTankWithDevice(s.ctx, org, 'Mosquitto tank')
  other = await createTankWithDevice(s.ctx, org, 'Neighbour tank')
})
afterAll(() => s.close())

/** Debian's mosquitto_pub, exactly as the README shows it. */
const mosquittoPub = (user: number, token: string, topic: string, message: string) =>
  run('mosquitto_pub', ['-h', '127.0.0.1', '-p', String(s.mqttPort), '-u', String(user), '-P', token, '-q', '1', '-t', topic, '-m', message], {
    timeout: 10_000,
  })
    .then(() => ({ ok: true, stderr: '' }))
    .catch((error: { stderr?: string }) => ({ ok: false, stderr: error.stderr ?? '' }))

describe('a device speaking through mosquitto_pub', () => {
  it('publishes a reading that appears on the tank series', async () => {
    const time = new Date(Date.now() - 60_000).toISOString()
    const result = await mosquittoPub(
      node.deviceId,
      node.token,
      readingsTopic(node.deviceId),
      JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value: 25.8, unit: 'C', time }] }),
    )
    expect(result.ok).toBe(true)
    const series = await s.ctx.sequelize.query<{ value: number }>(`SELECT value FROM readings WHERE tank_id = $1 AND metric = 'temperature' AND time = $2`, {
      bind: [node.tankId, time],
      type: QueryTypes.SELECT,
    })
    expect(series).toEqual([{ value: 25.8 }])
  })

  it('is refused at CONNECT with a wrong token', async () => {
    const result = await mosquittoPub(node.deviceId, `twd_${node.deviceId}_${'w'.repeat(43)}`, readingsTopic(node.deviceId), '{"v":1,"readings":[]}')
    expect(result.ok).toBe(false)
    expect(result.stderr).toMatch(/not authori[sz]ed|bad user name or password|Connection Refused/i)
  })

  it("cannot publish to another device's topic", async () => {
    const time = new Date().toISOString()
    await mosquittoPub(node.deviceId, node.token, readingsTopic(other.deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7, time }] }))
    const rows = await s.ctx.sequelize.query(`SELECT 1 FROM readings WHERE tank_id = $1`, { bind: [other.tankId], type: QueryTypes.SELECT })
    expect(rows).toHaveLength(0)
  })
})
