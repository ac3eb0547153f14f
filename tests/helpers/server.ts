import { testConfig, type Config } from '../../server/config'
import { startServer } from '../../server/server'
import { createTestDatabase } from './db'
import { createOrgIn } from './fixtures'

/** The whole instance (HTTP, live hub, embedded MQTT broker) on free ports over a private database. */
export async function startTestServer(overrides: Partial<Config> = {}) {
  const db = await createTestDatabase()
  const running = await startServer(testConfig({ databaseUrl: db.url, mqtt: { host: '127.0.0.1', port: 0 }, ...overrides }))
  return {
    ...running,
    baseUrl: `http://127.0.0.1:${running.port}`,
    mqttUrl: `mqtt://127.0.0.1:${running.mqttPort}`,
    createOrg: (name?: string) => createOrgIn(running.ctx, name),
    async close() {
      await running.stop()
      await db.drop()
    },
  }
}
