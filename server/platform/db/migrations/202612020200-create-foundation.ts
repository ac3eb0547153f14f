import type { Migration } from './migration'

const up = `
CREATE TABLE organizations (
  id serial PRIMARY KEY,
  name text NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE users (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  email text NOT NULL,
  name text NOT NULL,
  password_hash text NOT NULL,
  role text NOT NULL CHECK (role IN ('owner', 'keeper', 'viewer')),
  active boolean NOT NULL DEFAULT true,
  unit_preferences jsonb NOT NULL DEFAULT '{}',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE UNIQUE INDEX users_email_unique ON users (lower(email));
CREATE INDEX users_organization ON users (organization_id);

CREATE TABLE sites (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  name text NOT NULL,
  time_zone text NOT NULL,
  address text NOT NULL DEFAULT '',
  notes text NOT NULL DEFAULT '',
  archived_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX sites_organization ON sites (organization_id);

CREATE TABLE user_sites (
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  PRIMARY KEY (user_id, site_id)
);

CREATE TABLE sessions (
  id uuid PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  expires_at timestamptz NOT NULL,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX sessions_user ON sessions (user_id);

CREATE TABLE invitations (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  email text NOT NULL,
  name text NOT NULL,
  role text NOT NULL CHECK (role IN ('owner', 'keeper', 'viewer')),
  site_ids integer[] NOT NULL DEFAULT '{}',
  token_hash text NOT NULL UNIQUE,
  invited_by integer REFERENCES users(id) ON DELETE SET NULL,
  expires_at timestamptz NOT NULL,
  accepted_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX invitations_organization ON invitations (organization_id);

CREATE TABLE tanks (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id),
  name text NOT NULL,
  kind text NOT NULL,
  stage text NOT NULL,
  dimensions jsonb,
  volume_litres double precision NOT NULL CHECK (volume_litres > 0),
  volume_source text NOT NULL CHECK (volume_source IN ('dimensions', 'entered')),
  substrate_depth_cm double precision NOT NULL DEFAULT 0,
  heater jsonb,
  filter text NOT NULL DEFAULT '',
  media text NOT NULL DEFAULT '',
  light_schedule jsonb,
  targets jsonb NOT NULL DEFAULT '{}',
  notes text NOT NULL DEFAULT '',
  sort_order integer NOT NULL DEFAULT 0,
  archived_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX tanks_organization_site ON tanks (organization_id, site_id);
`

const down = `
DROP TABLE tanks; DROP TABLE invitations; DROP TABLE sessions; DROP TABLE user_sites;
DROP TABLE sites; DROP TABLE users; DROP TABLE organizations;
`

const migration: Migration = {
  name: '202612020200-create-foundation',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
