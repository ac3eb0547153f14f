import type { Migration } from './migration'

const up = `
-- The weekly pattern: one row per person per weekday (0 = Monday … 6 = Sunday), local wall-clock
-- times in the site's zone. An end at or before the start runs past midnight.
CREATE TABLE duty_shifts (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  weekday smallint NOT NULL CHECK (weekday BETWEEN 0 AND 6),
  start_time text NOT NULL CHECK (start_time ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$'),
  end_time text NOT NULL CHECK (end_time ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$'),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX duty_shifts_site ON duty_shifts (site_id, weekday);

-- One-off changes to the pattern, in real instants: 'add' puts a person on duty, 'remove' takes them off.
CREATE TABLE duty_overrides (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('add', 'remove')),
  starts_at timestamptz NOT NULL,
  ends_at timestamptz NOT NULL,
  note text NOT NULL DEFAULT '',
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (ends_at > starts_at)
);
CREATE INDEX duty_overrides_site_time ON duty_overrides (site_id, starts_at, ends_at);

-- Who hears about an alert when nobody is on duty; null means the organization's first active owner.
ALTER TABLE sites ADD COLUMN backup_user_id integer REFERENCES users(id) ON DELETE SET NULL;
`

const down = `ALTER TABLE sites DROP COLUMN backup_user_id; DROP TABLE duty_overrides; DROP TABLE duty_shifts;`

const migration: Migration = {
  name: '202612020340-create-duty-roster',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
