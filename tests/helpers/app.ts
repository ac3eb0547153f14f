import request from 'supertest'
import { createApp } from '../../server/app'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig, type Config } from '../../server/config'
import type { AppContext } from '../../server/context'
import { createTestDatabase } from './db'
import { createOrgIn } from './fixtures'

export { TEST_PASSWORD, type TestOrg } from './fixtures'

/** A real app over a real, private PostgreSQL database. Call `close()` in afterAll. */
export async function startTestApp(overrides: Partial<Config> = {}) {
  const db = await createTestDatabase()
  const ctx: AppContext = createContext(testConfig({ databaseUrl: db.url, ...overrides }))
  const app = createApp(ctx)
  const api = () => request(app)
  return {
    app,
    ctx,
    api,
    /** An organization with two sites and one signed-in user of each role. */
    createOrg: (name?: string) => createOrgIn(ctx, name),
    async close() {
      await closeContext(ctx)
      await db.drop()
    },
  }
}

export type TestApp = Awaited<ReturnType<typeof startTestApp>>

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
