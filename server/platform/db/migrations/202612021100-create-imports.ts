import type { Migration } from './migration'

const up = `
-- A named upload source ("Logger in fish room") and the column mapping last confirmed for it.
CREATE TABLE import_sources (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  name text NOT NULL,
  mapping jsonb NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (organization_id, name)
);

-- One uploaded file and its import. file_key is ours (random); file_name is the uploader's,
-- kept only to show, never used as a path.
CREATE TABLE import_jobs (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  tank_id integer REFERENCES tanks(id) ON DELETE CASCADE,
  source_id integer REFERENCES import_sources(id) ON DELETE SET NULL,
  file_key text NOT NULL UNIQUE,
  file_name text NOT NULL,
  size_bytes bigint NOT NULL,
  preview jsonb,
  mapping jsonb,
  status text NOT NULL CHECK (status IN ('uploaded', 'queued', 'running', 'done', 'cancelled', 'failed')),
  bytes_read bigint NOT NULL DEFAULT 0,
  rows_read integer NOT NULL DEFAULT 0,
  rows_accepted integer NOT NULL DEFAULT 0,
  rows_duplicate integer NOT NULL DEFAULT 0,
  rows_rejected integer NOT NULL DEFAULT 0,
  error text,
  has_report boolean NOT NULL DEFAULT false,
  started_at timestamptz,
  finished_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX import_jobs_organization ON import_jobs (organization_id, created_at DESC);
CREATE INDEX import_jobs_unfinished ON import_jobs (status) WHERE status IN ('queued', 'running');
`

const down = `DROP TABLE import_jobs; DROP TABLE import_sources;`

const migration: Migration = {
  name: '202612021100-create-imports',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
