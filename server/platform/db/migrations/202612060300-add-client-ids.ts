import type { Migration } from './migration'

// An id the phone makes for an entry written without a connection: sending it again finds the
// first row instead of storing a second one. Care-task completions are care-log rows too.
const up = `
ALTER TABLE test_kit_entries ADD COLUMN client_id uuid;
CREATE UNIQUE INDEX test_kit_entries_client_id_unique ON test_kit_entries (organization_id, client_id);
ALTER TABLE care_log ADD COLUMN client_id uuid;
CREATE UNIQUE INDEX care_log_client_id_unique ON care_log (organization_id, client_id);
`
const down = `
ALTER TABLE care_log DROP COLUMN client_id;
ALTER TABLE test_kit_entries DROP COLUMN client_id;
`

const migration: Migration = {
  name: '202612060300-add-client-ids',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
