import type { Migration } from './migration'

const up = `
CREATE TABLE wall_credentials (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  name text NOT NULL,
  token_hash text NOT NULL,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  last_used_at timestamptz,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX wall_credentials_site ON wall_credentials (site_id);
`

const migration: Migration = {
  name: '202612020400-create-wall-credentials',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query('DROP TABLE wall_credentials;')),
}
export default migration
