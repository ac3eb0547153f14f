import type { Migration } from './migration'

const up = `
CREATE TABLE test_kit_entries (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  entered_by integer REFERENCES users(id) ON DELETE SET NULL,
  taken_at timestamptz NOT NULL,
  "values" jsonb NOT NULL,
  notes text NOT NULL DEFAULT '',
  deleted_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX test_kit_entries_tank ON test_kit_entries (tank_id, taken_at);

-- Every edit or deletion keeps what the entry said before, for the tank's history.
CREATE TABLE test_kit_entry_revisions (
  id serial PRIMARY KEY,
  entry_id integer NOT NULL REFERENCES test_kit_entries(id) ON DELETE CASCADE,
  action text NOT NULL CHECK (action IN ('edit', 'delete')),
  changed_by integer REFERENCES users(id) ON DELETE SET NULL,
  snapshot jsonb NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX test_kit_entry_revisions_entry ON test_kit_entry_revisions (entry_id);
`

const migration: Migration = {
  name: '202612020300-create-test-kit-entries',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query('DROP TABLE test_kit_entry_revisions; DROP TABLE test_kit_entries;')),
}
export default migration
