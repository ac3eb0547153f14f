import bcrypt from 'bcryptjs'
import request from 'supertest'
import { createApp } from '../../server/app'
import { createContext } from '../../server/bootstrap'
import { testConfig, type Config } from '../../server/config'
import type { AppContext } from '../../server/context'
import { authService } from '../../server/services/auth'
import type { Role } from '../../shared/schemas/auth'
import { createTestDatabase } from './db'

export const TEST_PASSWORD = 'correct-horse-battery'
let passwordHash: string | undefined

export type TestOrg = {
  organizationId: number
  siteIds: number[]
  users: Record<Role, { id: number; email: string; token: string }>
}

/** A real app over a real, private PostgreSQL database. Call `close()` in afterAll. */
export async function startTestApp(overrides: Partial<Config> = {}) {
  const db = await createTestDatabase()
  const ctx: AppContext = createContext(testConfig({ databaseUrl: db.url, ...overrides }))
  const app = createApp(ctx)
  let counter = 0

  /** An organization with two sites and one user of each role, each signed in. */
  async function createOrg(name = `Org ${++counter}`): Promise<TestOrg> {
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
        email: `${role}@${slug}-${counter}.example`,
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

  const api = () => request(app)
  return {
    app,
    ctx,
    api,
    createOrg,
    async close() {
      await ctx.sequelize.close()
      await db.drop()
    },
  }
}

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` })

export function sampleTank(siteId: number, overrides: Record<string, unknown> = {}) {
  return {
    name: 'Test tank',
    siteId,
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 },
    heater: { watts: 200, setPointC: 26, topCm: 30 },
    lightSchedule: { on: '09:00', off: '20:00' },
    ...overrides,
  }
}
