// `npm run migrate`: applies pending migrations to the database DATABASE_URL names, for deployments
// that migrate before starting the app (`npm start` and the app itself migrate on start anyway).
import { migrate } from './migrate'
import { createSequelize } from './sequelize'

const url = process.env.DATABASE_URL
if (!url) {
  console.error('DATABASE_URL is not set. Example: DATABASE_URL=postgres://tankwarden@127.0.0.1:5432/tankwarden npm run migrate')
  process.exit(2)
}
const sequelize = createSequelize(url)
try {
  const applied = await migrate(sequelize)
  console.log(applied.length ? `Applied ${applied.length} migration(s):\n  ${applied.join('\n  ')}` : 'The database is up to date.')
} catch (error) {
  console.error(`Migration failed: ${error instanceof Error ? error.message : error}`)
  process.exitCode = 1
} finally {
  await sequelize.close()
}
