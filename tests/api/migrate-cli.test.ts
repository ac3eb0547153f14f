import { spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { migrations } from '../../server/platform/db/migrations'
import { adminUrl, databaseUrl } from '../helpers/db-urls'

const root = join(__dirname, '..', '..')
const runMigrate = (env: Record<string, string | undefined>) =>
  spawnSync(process.execPath, ['--import', 'tsx', join(root, 'server/platform/db/migrate-cli.ts')], {
    cwd: root,
    env: { ...process.env, ...env },
    encoding: 'utf8',
    timeout: 60_000,
  })

// `npm run migrate` runs this file with tsx, on an empty database as a deployment would.
describe('npm run migrate', () => {
  const name = `tw_migrate_${randomBytes(5).toString('hex')}`
  const admin = new pg.Client({ connectionString: adminUrl() })
  beforeAll(async () => {
    await admin.connect()
    await admin.query(`CREATE DATABASE ${name}`)
  })
  afterAll(async () => {
    await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
    await admin.end()
  })

  it('applies every migration to an empty database, then finds nothing to do', async () => {
    const first = runMigrate({ DATABASE_URL: databaseUrl(name) })
    expect(first.stderr).toBe('')
    expect(first.status).toBe(0)
    expect(first.stdout).toContain(`Applied ${migrations.length} migration(s):`)
    const db = new pg.Client({ connectionString: databaseUrl(name) })
    await db.connect()
    const { rows } = await db.query('SELECT name FROM schema_migrations ORDER BY name')
    await db.end()
    expect(rows.map((r) => r.name)).toEqual(migrations.map((m) => m.name).sort())

    const second = runMigrate({ DATABASE_URL: databaseUrl(name) })
    expect(second.status).toBe(0)
    expect(second.stdout.trim()).toBe('The database is up to date.')
  })

  it('without DATABASE_URL says what to set and exits 2', () => {
    const result = runMigrate({ DATABASE_URL: '' })
    expect(result.status).toBe(2)
    expect(result.stderr).toContain('DATABASE_URL is not set')
  })
})
