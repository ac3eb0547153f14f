import type { Migration } from './migration'

// A livestock row is a batch: animals that arrived together, in one tank at a time. Moving part
// of a batch splits off a new batch (parent_id) in the target tank; moved_out counts the animals
// that left a batch alive (split off, sold, gone to a client's tank). livestock_events is each
// batch's history: arrival, moves, losses with their cause, and where the animals went.
const up = `
ALTER TABLE livestock ADD COLUMN parent_id integer REFERENCES livestock(id) ON DELETE SET NULL;
ALTER TABLE livestock ADD COLUMN moved_out integer NOT NULL DEFAULT 0 CHECK (moved_out >= 0);
CREATE INDEX livestock_parent ON livestock (parent_id) WHERE parent_id IS NOT NULL;

CREATE TABLE livestock_events (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  livestock_id integer NOT NULL REFERENCES livestock(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('arrived', 'moved', 'lost', 'sold', 'to_client', 'removed')),
  at timestamptz NOT NULL,
  count integer NOT NULL CHECK (count >= 0),
  from_tank_id integer REFERENCES tanks(id) ON DELETE SET NULL,
  to_tank_id integer REFERENCES tanks(id) ON DELETE SET NULL,
  split_id integer REFERENCES livestock(id) ON DELETE SET NULL,
  cause text NOT NULL DEFAULT '',
  destination text NOT NULL DEFAULT '',
  user_id integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX livestock_events_batch ON livestock_events (livestock_id, at, id);
`
const down = `DROP TABLE livestock_events; DROP INDEX livestock_parent; ALTER TABLE livestock DROP COLUMN moved_out; ALTER TABLE livestock DROP COLUMN parent_id;`

const migration: Migration = {
  name: '202612060600-add-livestock-batches',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
