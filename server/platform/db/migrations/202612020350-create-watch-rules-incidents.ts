import type { Migration } from './migration'

const up = `
-- A rule belongs to one tank, or to a whole site (tank_id NULL) where it applies to every tank
-- that has no rule overriding it (overrides_rule_id).
CREATE TABLE watch_rules (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  tank_id integer REFERENCES tanks(id) ON DELETE CASCADE,
  overrides_rule_id integer REFERENCES watch_rules(id) ON DELETE CASCADE,
  name text NOT NULL,
  severity text NOT NULL CHECK (severity IN ('warning', 'alarm')),
  spec jsonb NOT NULL,
  enabled boolean NOT NULL DEFAULT true,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (overrides_rule_id IS NULL OR tank_id IS NOT NULL)
);
CREATE INDEX watch_rules_tank ON watch_rules (tank_id);
CREATE INDEX watch_rules_site ON watch_rules (site_id) WHERE tank_id IS NULL;
CREATE UNIQUE INDEX watch_rules_one_override ON watch_rules (tank_id, overrides_rule_id) WHERE overrides_rule_id IS NOT NULL;

CREATE TABLE incidents (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  rule_id integer REFERENCES watch_rules(id) ON DELETE SET NULL,
  rule_kind text NOT NULL,
  metric text NOT NULL,
  severity text NOT NULL CHECK (severity IN ('warning', 'alarm')),
  title text NOT NULL,
  state text NOT NULL CHECK (state IN ('open', 'acknowledged', 'resolved')),
  condition_since timestamptz NOT NULL,
  opened_at timestamptz NOT NULL,
  first_value double precision,
  peak_value double precision,
  latest_value double precision,
  latest_at timestamptz,
  snoozed boolean NOT NULL DEFAULT false,
  acknowledged_at timestamptz,
  acknowledged_by integer REFERENCES users(id) ON DELETE SET NULL,
  acknowledge_note text,
  resolved_at timestamptz,
  resolved_by integer REFERENCES users(id) ON DELETE SET NULL,
  resolve_note text,
  escalation_level integer NOT NULL DEFAULT 0,
  next_escalation_at timestamptz,
  next_repeat_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
-- Exactly one unresolved incident per rule and tank.
CREATE UNIQUE INDEX incidents_one_open ON incidents (rule_id, tank_id) WHERE state <> 'resolved';
CREATE INDEX incidents_site_state ON incidents (site_id, state, opened_at DESC);
CREATE INDEX incidents_tank ON incidents (tank_id, opened_at DESC);
CREATE INDEX incidents_due ON incidents (next_escalation_at, next_repeat_at) WHERE state = 'open';

CREATE TABLE incident_events (
  id bigserial PRIMARY KEY,
  incident_id integer NOT NULL REFERENCES incidents(id) ON DELETE CASCADE,
  at timestamptz NOT NULL DEFAULT now(),
  kind text NOT NULL,
  user_id integer REFERENCES users(id) ON DELETE SET NULL,
  detail jsonb NOT NULL DEFAULT '{}'
);
CREATE INDEX incident_events_incident ON incident_events (incident_id, at);

-- Rule snoozes for one tank: one-off (starts_at..ends_at) or weekly (weekday + start + minutes until repeat_until).
CREATE TABLE snoozes (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  reason text NOT NULL,
  starts_at timestamptz NOT NULL,
  ends_at timestamptz NOT NULL CHECK (ends_at > starts_at),
  weekly boolean NOT NULL DEFAULT false,
  repeat_until timestamptz,
  include_heater_line boolean NOT NULL DEFAULT false,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  reminded_at timestamptz,
  cancelled_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (NOT weekly OR repeat_until IS NOT NULL)
);
CREATE INDEX snoozes_tank ON snoozes (tank_id);

-- One-click acknowledge links in alert mails: single use, expiring, stored as a hash.
CREATE TABLE incident_ack_links (
  id serial PRIMARY KEY,
  incident_id integer NOT NULL REFERENCES incidents(id) ON DELETE CASCADE,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  token_hash text NOT NULL UNIQUE,
  expires_at timestamptz NOT NULL,
  used_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
`

const down = `DROP TABLE incident_ack_links; DROP TABLE snoozes; DROP TABLE incident_events; DROP TABLE incidents; DROP TABLE watch_rules;`

const migration: Migration = {
  name: '202612020350-create-watch-rules-incidents',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
