import type { Migration } from './migration'

// When a tank last changed stage: the quarantine clock reads it. Existing tanks take their
// creation time, the best we know; the tanks service moves it whenever the stage changes.
const up = `
ALTER TABLE tanks ADD COLUMN stage_changed_at timestamptz;
UPDATE tanks SET stage_changed_at = created_at;
ALTER TABLE tanks ALTER COLUMN stage_changed_at SET NOT NULL, ALTER COLUMN stage_changed_at SET DEFAULT now();
`
const down = `ALTER TABLE tanks DROP COLUMN stage_changed_at;`

const migration: Migration = {
  name: '202612021000-add-tank-stage-changed-at',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
