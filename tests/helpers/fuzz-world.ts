import { expect } from 'vitest'
import { ackLinksService } from '../../server/incidents/ack-links'
import { bearer, sampleTank, startTestApp, TEST_PASSWORD, type TestOrg } from './app'
import { createIncidentRow, createTankWithDevice } from './fixtures'

const HOUR = 3600_000
export const inHours = (h: number) => new Date(Date.now() + h * HOUR).toISOString()

/** One organization with a row of every kind a body route acts on, made through the API where it can be. */
export async function buildFuzzWorld() {
  const t = await startTestApp({ signInLimit: 1_000_000 })
  const org: TestOrg = await t.createOrg('Marrowfen Fuzz Aquatics')
  const owner = org.users.owner.token
  const keeper = org.users.keeper.token
  const siteId = org.siteIds[0]
  const api = (method: 'post' | 'put' | 'patch', path: string, body: unknown, token = owner) =>
    t
      .api()
      [method](`/api/v1${path}`)
      .set(bearer(token))
      .send(body as object)
  const created = async (method: 'post' | 'put', path: string, body: unknown, token = owner) => {
    const res = await api(method, path, body, token)
    expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBeLessThan(300)
    return res.body
  }

  const tankId = (await created('post', '/tanks', sampleTank(siteId, { name: 'Fuzz display tank' }))).id as number
  const careTankId = (await created('post', '/tanks', sampleTank(siteId, { name: 'Fuzz care tank' }))).id as number
  const device = (await created('post', '/devices', { tankId, name: 'Fuzz probe', metrics: ['temperature', 'ph'], intervalSeconds: 60 })).device
  const sensor = await createTankWithDevice(t.ctx, org, 'Fuzz sensor tank')
  const target = await t.ctx.models.User.create({
    organizationId: org.organizationId,
    email: 'target@fuzz.example',
    name: 'Fuzz target',
    role: 'keeper',
    passwordHash: 'unused',
  })
  const kitEntry = await created('post', `/tanks/${tankId}/test-kit-entries`, { values: [{ metric: 'ph', value: 7.1, unit: 'pH' }] }, keeper)
  const siteRule = await created('post', `/sites/${siteId}/rules`, { name: 'pH low', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.5 } })
  const tankRule = await created('post', `/tanks/${tankId}/rules`, {
    name: 'Warm',
    severity: 'alarm',
    spec: { kind: 'above', metric: 'temperature', limit: 29 },
  })
  const shift = await created('post', `/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 1, start: '08:00', end: '16:00' })
  const incidentRow = () => createIncidentRow(t.ctx, org, tankId, { siteId })
  const ackIncident = await incidentRow()
  const resolveIncident = await incidentRow()
  const linkIncident = await incidentRow()
  const ackLink = await ackLinksService(t.ctx).create(linkIncident.id, org.users.keeper.id)
  const ackToken = new URL(ackLink).searchParams.get('token')!
  const careTask = await created('post', `/tanks/${careTankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 7 } })
  const waterChange = await created('post', `/tanks/${careTankId}/water-changes`, { percent: 20, heaterOffConfirmed: true })
  const fish = await created('post', `/tanks/${careTankId}/livestock`, { name: 'Harlequin rasbora', category: 'fish', count: 12 })

  return {
    t,
    org,
    owner,
    keeper,
    siteId,
    tankId,
    careTankId,
    password: TEST_PASSWORD,
    deviceId: device.id as number,
    sensor,
    targetUserId: target.id,
    kitEntryId: kitEntry.id as number,
    siteRuleId: siteRule.id as number,
    tankRuleId: tankRule.id as number,
    shiftId: shift.id as number,
    ackIncidentId: ackIncident.id,
    resolveIncidentId: resolveIncident.id,
    ackToken,
    careTaskId: careTask.id as number,
    waterChangeId: (waterChange.id ?? waterChange.waterChange?.id) as number,
    livestockId: (fish.entry?.id ?? fish.id) as number,
  }
}

export type FuzzWorld = Awaited<ReturnType<typeof buildFuzzWorld>>
