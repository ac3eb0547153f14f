import { execFile } from 'node:child_process'
import { promisify } from 'node:util'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { tanksService } from '../../server/tanks/tanks'
import { sampleTank } from '../helpers/app'
import { TEST_PASSWORD, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

const run = promisify(execFile)
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Simulated Shop')
  const owner = {
    kind: 'user' as const,
    userId: org.users.owner.id,
    organizationId: org.organizationId,
    role: 'owner' as const,
    siteIds: null,
    sessionId: 'seed',
  }
  await tanksService(s.ctx).create(owner, sampleTank(org.siteIds[0], { name: 'Sim A' }) as never)
  await tanksService(s.ctx).create(owner, sampleTank(org.siteIds[0], { name: 'Sim B', kind: 'planted' }) as never)
  await tanksService(s.ctx).create(owner, sampleTank(org.siteIds[1], { name: 'Sim empty', stage: 'empty' }) as never)
})
afterAll(() => s.close())

/** The simulator as its own program, speaking only the public API and MQTT. */
const simulate = (...args: string[]) =>
  run(
    process.execPath,
    [
      '--import',
      'tsx',
      'simulator/index.ts',
      '--url',
      s.baseUrl,
      '--email',
      org.users.owner.email,
      '--password',
      TEST_PASSWORD,
      '--mqtt-url',
      s.mqttUrl,
      ...args,
    ],
    {
      timeout: 60_000,
    },
  )

describe('the simulator against a running app', () => {
  it('provisions a device per non-empty tank and delivers plausible readings over MQTT', async () => {
    const { stdout } = await simulate('--once', '--transport', 'mqtt')
    expect(stdout).toMatch(/tick/)
    const devices = await s.ctx.models.Device.findAll({ where: { organizationId: org.organizationId }, include: [{ association: 'tank' }] })
    expect(devices.map((d) => d.tank!.name).sort()).toEqual(['Sim A', 'Sim B'])
    const rows = await s.ctx.sequelize.query<{ name: string; metric: string; value: number }>(
      `SELECT t.name, r.metric, r.value FROM readings r JOIN tanks t ON t.id = r.tank_id WHERE t.organization_id = $1 ORDER BY t.name, r.metric`,
      { bind: [org.organizationId], type: QueryTypes.SELECT },
    )
    expect(new Set(rows.map((r) => `${r.name}:${r.metric}`))).toEqual(
      new Set(['Sim A:light', 'Sim A:ph', 'Sim A:temperature', 'Sim A:water_level', 'Sim B:light', 'Sim B:ph', 'Sim B:temperature', 'Sim B:water_level']),
    )
    for (const r of rows.filter((x) => x.metric === 'temperature')) expect(r.value).toBeGreaterThan(18)
    for (const r of rows.filter((x) => x.metric === 'ph')) expect(r.value).toBeGreaterThan(5)
  }, 90_000)

  it('rotates the same devices on a second run instead of creating more, and works over HTTP', async () => {
    await simulate('--once', '--transport', 'http')
    const devices = await s.ctx.models.Device.count({ where: { organizationId: org.organizationId } })
    expect(devices).toBe(2)
    const [{ n }] = await s.ctx.sequelize.query<{ n: number }>(
      `SELECT count(DISTINCT time)::int AS n FROM readings r JOIN tanks t ON t.id = r.tank_id WHERE t.name = 'Sim A'`,
      { type: QueryTypes.SELECT },
    )
    expect(n).toBe(2)
  }, 90_000)
})
