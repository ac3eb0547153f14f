import { spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { adminUrl, databaseUrl } from '../helpers/db-urls'

const root = join(__dirname, '..', '..')
const BUSINESS = [
  '--business',
  'Tidepool Rentals',
  '--owner',
  'Oren Lusk',
  '--email',
  'oren@tidepool.example',
  '--site',
  'Workshop',
  '--time-zone',
  'Europe/Vienna',
]
const runSetup = (args: string[], env: Record<string, string | undefined>, input?: string) =>
  spawnSync(process.execPath, ['--import', 'tsx', join(root, 'server/setup/setup-cli.ts'), ...args], {
    cwd: root,
    env: { ...process.env, LOG_LEVEL: 'silent', ...env },
    encoding: 'utf8',
    input,
    timeout: 90_000,
  })

// `npm run setup` runs this file with tsx, on an empty database as a scripted install would.
describe('npm run setup', () => {
  const name = `tw_setup_${randomBytes(5).toString('hex')}`
  const admin = new pg.Client({ connectionString: adminUrl() })
  beforeAll(async () => {
    await admin.connect()
    await admin.query(`CREATE DATABASE ${name}`)
  })
  afterAll(async () => {
    await admin.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
    await admin.end()
  })

  it('refuses bad input naming the option, and a missing password file', () => {
    const noFile = runSetup(BUSINESS, { DATABASE_URL: databaseUrl(name) })
    expect(noFile.status).toBe(2)
    expect(noFile.stderr).toContain('--password-file is required')
    const short = runSetup([...BUSINESS, '--password-file', '-'], { DATABASE_URL: databaseUrl(name) }, 'short\n')
    expect(short.status).toBe(2)
    expect(short.stderr).toContain('--password-file: at least 10 characters')
  }, 120_000)

  it('sets up the business from a password on standard input, then refuses a second time (exit 3)', async () => {
    const first = runSetup([...BUSINESS, '--password-file', '-'], { DATABASE_URL: databaseUrl(name) }, 'a-long-enough-password\n')
    expect(first.stderr).toBe('')
    expect(first.status).toBe(0)
    expect(first.stdout).toContain('Sign in as oren@tidepool.example')
    const db = new pg.Client({ connectionString: databaseUrl(name) })
    await db.connect()
    const { rows } = await db.query(
      `SELECT o.name AS business, s.name AS site, s.time_zone, u.email, u.role FROM organizations o JOIN sites s ON s.organization_id = o.id JOIN users u ON u.organization_id = o.id`,
    )
    await db.end()
    expect(rows).toEqual([{ business: 'Tidepool Rentals', site: 'Workshop', time_zone: 'Europe/Vienna', email: 'oren@tidepool.example', role: 'owner' }])

    const dir = mkdtempSync(join(tmpdir(), 'tw-setup-'))
    writeFileSync(join(dir, 'password'), 'another-long-password\n', { mode: 0o600 })
    const second = runSetup([...BUSINESS, '--password-file', join(dir, 'password')], { DATABASE_URL: databaseUrl(name) })
    expect(second.status).toBe(3)
    expect(second.stderr).toContain('already set up')
  }, 120_000)
})
