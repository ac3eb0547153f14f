import type { Migration } from './migration'

// The first-steps checklist an owner sees after setup: the steps they chose to hide, per organisation.
const up = `ALTER TABLE organizations ADD COLUMN checklist_dismissed text[] NOT NULL DEFAULT '{}';`
const down = `ALTER TABLE organizations DROP COLUMN checklist_dismissed;`

const migration: Migration = {
  name: '202612051300-add-checklist-dismissed',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
