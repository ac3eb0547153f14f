import type { Migration } from './migration'

// How the organisation reads clock times on its screens: 24-hour (the default) or 12-hour.
const up = `ALTER TABLE organizations ADD COLUMN clock_style text NOT NULL DEFAULT '24h' CHECK (clock_style IN ('24h', '12h'));`
const down = `ALTER TABLE organizations DROP COLUMN clock_style;`

const migration: Migration = {
  name: '202612060700-add-organization-clock-style',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
