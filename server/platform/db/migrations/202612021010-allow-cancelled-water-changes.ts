import type { Migration } from './migration'

// A started water change may be called off: it is then neither in progress nor finished, and
// keeps who cancelled it and when. The one-open-per-tank index only covers in_progress rows.
const up = `
ALTER TABLE water_changes DROP CONSTRAINT water_changes_status_check;
ALTER TABLE water_changes ADD CONSTRAINT water_changes_status_check CHECK (status IN ('in_progress', 'finished', 'cancelled'));
ALTER TABLE water_changes ADD COLUMN cancelled_at timestamptz;
ALTER TABLE water_changes ADD COLUMN cancelled_by integer REFERENCES users(id) ON DELETE SET NULL;
ALTER TABLE water_changes ADD COLUMN cancel_reason text;
ALTER TABLE water_changes ADD CONSTRAINT water_changes_cancelled_check CHECK ((status = 'cancelled') = (cancelled_at IS NOT NULL));
`
const down = `
DELETE FROM water_changes WHERE status = 'cancelled';
ALTER TABLE water_changes DROP CONSTRAINT water_changes_cancelled_check;
ALTER TABLE water_changes DROP COLUMN cancel_reason, DROP COLUMN cancelled_by, DROP COLUMN cancelled_at;
ALTER TABLE water_changes DROP CONSTRAINT water_changes_status_check;
ALTER TABLE water_changes ADD CONSTRAINT water_changes_status_check CHECK (status IN ('in_progress', 'finished'));
`

const migration: Migration = {
  name: '202612021010-allow-cancelled-water-changes',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
