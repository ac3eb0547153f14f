import pg from 'pg'
import { createSequelize } from '../../server/platform/db/sequelize'
import { migrate } from '../../server/platform/db/migrate'
import { compileEntries } from './compiled-server'
import { TEMPLATE_DB, adminUrl, databaseUrl } from './db-urls'

/** Once per run: a migrated template database that every test file clones, and the app compiled for the suites that start it as a process. */
export default async function setup() {
  if (!process.env.DATABASE_URL) {
    throw new Error('DATABASE_URL is not set: run the suites through `npm test`, which starts a throwaway PostgreSQL')
  }
  // Several vitest projects name this setup; the template is made once per run.
  if (process.env.TW_TEMPLATE_READY === TEMPLATE_DB) return
  const admin = new pg.Client({ connectionString: adminUrl() })
  await admin.connect()
  await admin.query(`DROP DATABASE IF EXISTS ${TEMPLATE_DB}`)
  await admin.query(`CREATE DATABASE ${TEMPLATE_DB}`)
  await admin.end()
  const sequelize = createSequelize(databaseUrl(TEMPLATE_DB))
  await Promise.all([migrate(sequelize), compileEntries()])
  await sequelize.close()
  process.env.TW_TEMPLATE_READY = TEMPLATE_DB
}
