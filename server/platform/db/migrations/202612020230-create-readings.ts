import type { Migration } from './migration'

const up = `
CREATE TABLE devices (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id),
  name text NOT NULL,
  metrics text[] NOT NULL DEFAULT '{}',
  interval_seconds integer NOT NULL CHECK (interval_seconds BETWEEN 1 AND 86400),
  token_hash text NOT NULL,
  last_seen_at timestamptz,
  last_error text,
  last_error_at timestamptz,
  rejected_count bigint NOT NULL DEFAULT 0,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX devices_tank ON devices (tank_id);
CREATE INDEX devices_organization ON devices (organization_id);

-- One row per value. source_key says where it came from ('d:<device id>', 'k:<entry id>', 'i:<import id>'),
-- so a retried batch from the same source is stored once.
CREATE TABLE readings (
  source_key text NOT NULL,
  metric text NOT NULL,
  time timestamptz NOT NULL,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  value double precision NOT NULL,
  source text NOT NULL CHECK (source IN ('device', 'test_kit', 'import')),
  PRIMARY KEY (source_key, metric, time)
);
CREATE INDEX readings_tank_metric_time ON readings (tank_id, metric, time);

-- Hourly rollups outlive raw readings (retention job).
CREATE TABLE readings_hourly (
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  metric text NOT NULL,
  hour timestamptz NOT NULL,
  min double precision NOT NULL,
  max double precision NOT NULL,
  sum double precision NOT NULL,
  count integer NOT NULL,
  PRIMARY KEY (tank_id, metric, hour)
);
`

const down = `DROP TABLE readings_hourly; DROP TABLE readings; DROP TABLE devices;`

const migration: Migration = {
  name: '202612020230-create-readings',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
