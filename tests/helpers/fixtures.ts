import bcrypt from 'bcryptjs'
import type { AppContext } from '../../server/context'
import { newDeviceToken } from '../../server/devices/device-tokens'
import { authService } from '../../server/people/auth'
import type { Role } from '@shared/schemas/auth'
import type { InferCreationAttributes } from 'sequelize'
import type { Tank } from '../../server/tanks/tank-model'
import type { Incident } from '../../server/incidents/models'

export const TEST_PASSWORD = 'correct-horse-battery'
let passwordHash: string | undefined
let counter = 0

export type TestOrg = {
  organizationId: number
  siteIds: number[]
  users: Record<Role, { id: number; email: string; token: string }>
}

/** An organization with two sites and one user of each role, each signed in. */
export async function createOrgIn(ctx: AppContext, name = `Org ${counter + 1}`): Promise<TestOrg> {
  counter++
  passwordHash ??= await bcrypt.hash(TEST_PASSWORD, 4)
  const org = await ctx.models.Organization.create({ name })
  const siteA = await ctx.models.Site.create({ organizationId: org.id, name: `${name} shop`, timeZone: 'Europe/Berlin' })
  const siteB = await ctx.models.Site.create({ organizationId: org.id, name: `${name} fish room`, timeZone: 'America/New_York' })
  const auth = authService(ctx)
  const users = {} as TestOrg['users']
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-')
  for (const role of ['owner', 'keeper', 'viewer'] as const) {
    const user = await ctx.models.User.create({
      organizationId: org.id,
      email: `${role}@${slug}-${counter}-${process.pid}.example`,
      name: `${role} of ${name}`,
      role,
      passwordHash,
    })
    await user.reload({ include: [{ association: 'sites' }] })
    const session = await auth.openSession(user)
    users[role] = { id: user.id, email: user.email, token: session.token }
  }
  return { organizationId: org.id, siteIds: [siteA.id, siteB.id], users }
}

/**
 * A tank row written straight to its table (so without the starter rules and care tasks the tanks
 * service adds): 100 × 40 × 50 cm, 200 L, a 200 W heater with its top at 30 cm, lights 09:00–20:00,
 * in the organization's first site. `fields` replace any of it.
 */
export function createTankRow(ctx: AppContext, org: TestOrg, fields: Partial<InferCreationAttributes<Tank>> = {}) {
  return ctx.models.Tank.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0]!,
    name: 'Test tank',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 },
    volumeLitres: 200,
    volumeSource: 'dimensions',
    substrateDepthCm: 0,
    heater: { watts: 200, setPointC: 26, topCm: 30 },
    filter: '',
    media: '',
    lightSchedule: { on: '09:00', off: '20:00' },
    targets: {},
    notes: '',
    sortOrder: 0,
    ...fields,
  })
}

/** A tank with a device reporting temperature, pH, light and water level; answers the device token. */
export async function createTankWithDevice(ctx: AppContext, org: TestOrg, name = 'Tank with sensor') {
  const tank = await createTankRow(ctx, org, { name, targets: { temperature: { min: 24, max: 28 } } })
  const device = await ctx.models.Device.create({
    organizationId: org.organizationId,
    tankId: tank.id,
    name: `${name} node`,
    metrics: ['temperature', 'ph', 'light', 'water_level'],
    intervalSeconds: 60,
    tokenHash: 'pending',
  })
  const { token, hash } = newDeviceToken(device.id)
  await device.update({ tokenHash: hash })
  return { tankId: tank.id, deviceId: device.id, token }
}

/**
 * An open incident row written straight to its table: an alarm for temperature above 28 °C, at
 * 28.6 °C since now, in the organization's first site, without a rule. `fields` replace any of it.
 */
export function createIncidentRow(ctx: AppContext, org: TestOrg, tankId: number, fields: Partial<InferCreationAttributes<Incident>> = {}) {
  const at = new Date()
  return ctx.models.Incident.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0]!,
    tankId,
    ruleId: null,
    ruleKind: 'above',
    metric: 'temperature',
    severity: 'alarm',
    title: 'Temperature above 28 °C for 10 min',
    state: 'open',
    conditionSince: at,
    openedAt: at,
    firstValue: 28.6,
    peakValue: 28.6,
    latestValue: 28.6,
    latestAt: at,
    ...fields,
  })
}
