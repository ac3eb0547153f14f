import type { Migration } from './migration'

const up = `
-- A periodic client report: one tank or one site, weekly or monthly, to addresses and/or users.
-- last_sent_period is the first local day of the last period sent, so each period goes out once.
CREATE TABLE report_schedules (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer REFERENCES tanks(id) ON DELETE CASCADE,
  site_id integer REFERENCES sites(id) ON DELETE CASCADE,
  period text NOT NULL CHECK (period IN ('week', 'month')),
  emails text[] NOT NULL DEFAULT '{}',
  user_ids integer[] NOT NULL DEFAULT '{}',
  enabled boolean NOT NULL DEFAULT true,
  last_sent_period text,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((tank_id IS NULL) <> (site_id IS NULL))
);
CREATE INDEX report_schedules_organization ON report_schedules (organization_id);
`

const migration: Migration = {
  name: '202612021400-create-report-schedules',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query('DROP TABLE report_schedules')),
}
export default migration
