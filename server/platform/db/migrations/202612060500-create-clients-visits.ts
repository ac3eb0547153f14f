import type { Migration } from './migration'

const up = `
-- Who owns the tanks a tank-care business maintains. A client's people sign in as viewers of
-- exactly the client's tanks (users.client_id), never of a whole site.
CREATE TABLE clients (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('person', 'company')),
  name text NOT NULL,
  contact_name text NOT NULL DEFAULT '',
  email text NOT NULL DEFAULT '',
  phone text NOT NULL DEFAULT '',
  address text NOT NULL DEFAULT '',
  notes text NOT NULL DEFAULT '',
  archived_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX clients_organization ON clients (organization_id);
ALTER TABLE tanks ADD COLUMN client_id integer REFERENCES clients(id) ON DELETE SET NULL;
CREATE INDEX tanks_client ON tanks (client_id) WHERE client_id IS NOT NULL;
ALTER TABLE users ADD COLUMN client_id integer REFERENCES clients(id) ON DELETE SET NULL;
ALTER TABLE invitations ADD COLUMN client_id integer REFERENCES clients(id) ON DELETE CASCADE;

-- A periodic report may cover all of one client's tanks in one mail.
ALTER TABLE report_schedules DROP CONSTRAINT report_schedules_check;
ALTER TABLE report_schedules ADD COLUMN client_id integer REFERENCES clients(id) ON DELETE CASCADE;
ALTER TABLE report_schedules ADD CONSTRAINT report_schedules_one_subject
  CHECK ((tank_id IS NOT NULL)::int + (site_id IS NOT NULL)::int + (client_id IS NOT NULL)::int = 1);

-- A technician's stop at a client's site; a round is one technician's visits of a day, by start.
CREATE TABLE visits (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  client_id integer NOT NULL REFERENCES clients(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  technician_id integer NOT NULL REFERENCES users(id),
  starts_at timestamptz NOT NULL,
  ends_at timestamptz NOT NULL CHECK (ends_at > starts_at),
  tank_ids integer[] NOT NULL,
  state text NOT NULL DEFAULT 'planned' CHECK (state IN ('planned', 'started', 'closed')),
  arrived_at timestamptz,
  left_at timestamptz,
  notes text NOT NULL DEFAULT '',
  materials jsonb NOT NULL DEFAULT '[]',
  work jsonb NOT NULL DEFAULT '[]',
  photo_ids integer[] NOT NULL DEFAULT '{}',
  closed_at timestamptz,
  closed_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX visits_round ON visits (organization_id, technician_id, starts_at);
CREATE INDEX visits_client ON visits (client_id, starts_at);
`

const down = `
DROP TABLE visits;
ALTER TABLE report_schedules DROP CONSTRAINT report_schedules_one_subject;
DELETE FROM report_schedules WHERE client_id IS NOT NULL;
ALTER TABLE report_schedules DROP COLUMN client_id;
ALTER TABLE report_schedules ADD CONSTRAINT report_schedules_check CHECK ((tank_id IS NULL) <> (site_id IS NULL));
ALTER TABLE invitations DROP COLUMN client_id;
ALTER TABLE users DROP COLUMN client_id;
ALTER TABLE tanks DROP COLUMN client_id;
DROP TABLE clients;
`

/**
 * The outbox's kinds as the database has them now, plus or minus one: read from the constraint
 * itself, so branches that each add a kind of mail compose in either order.
 */
async function setMailKind(qi: Parameters<Migration['up']>[0], kind: string, present: boolean) {
  const [rows] = (await qi.sequelize.query("SELECT pg_get_constraintdef(oid) AS def FROM pg_constraint WHERE conname = 'mail_outbox_kind_check'")) as [
    Array<{ def: string }>,
    unknown,
  ]
  const kinds = new Set([...(rows[0]?.def ?? '').matchAll(/'([a-z_]+)'/g)].map((m) => m[1]))
  if (present) kinds.add(kind)
  else kinds.delete(kind)
  const list = [...kinds].map((k) => `'${k}'`).join(', ')
  await qi.sequelize.query(`ALTER TABLE mail_outbox DROP CONSTRAINT mail_outbox_kind_check, ADD CONSTRAINT mail_outbox_kind_check CHECK (kind IN (${list}))`)
}

const migration: Migration = {
  name: '202612060500-create-clients-visits',
  up: async (qi) => {
    await qi.sequelize.query(up)
    await setMailKind(qi, 'visit_report', true)
  },
  down: async (qi) => {
    await qi.sequelize.query("DELETE FROM mail_outbox WHERE kind = 'visit_report'")
    await setMailKind(qi, 'visit_report', false)
    await qi.sequelize.query(down)
  },
}
export default migration
