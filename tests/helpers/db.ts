import { randomBytes } from 'node:crypto'
import pg from 'pg'
import { TEMPLATE_DB, adminUrl, databaseUrl } from './db-urls'

/** A fresh database cloned from the migrated template; each test file gets its own. */
export async function createTestDatabase(): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `tw_test_${randomBytes(6).toString('hex')}`
  const admin = new pg.Client({ connectionString: adminUrl() })
  await admin.connect()
  for (let attempt = 0; ; attempt++) {
    try {
      await admin.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE_DB}`)
      break
    } catch (error) {
      // Two files cloning at the same instant can collide on the template; try again shortly.
      if (attempt >= 20) throw error
      await new Promise((r) => setTimeout(r, 100 + Math.random() * 200))
    }
  }
  await admin.end()
  return {
    url: databaseUrl(name),
    async drop() {
      const c = new pg.Client({ connectionString: adminUrl() })
      await c.connect()
      await c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
      await c.end()
    },
  }
}
