import type { Migration } from './migration'

// Where a site's working day ends (HH:MM on its clock), from which the owner's overview counts the
// night; null while the site names none and the overview assumes 18:00.
const up = `ALTER TABLE sites ADD COLUMN workday_end text CHECK (workday_end ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$');`
const down = `ALTER TABLE sites DROP COLUMN workday_end;`

const migration: Migration = {
  name: '202612060710-add-site-workday-end',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
