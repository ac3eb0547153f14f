import type { Migration } from './migration'

const OLD_MAIL_KINDS = [
  'incident_opened',
  'incident_escalated',
  'incident_repeat',
  'incident_resolved',
  'device_back',
  'invitation',
  'password_reset',
  'care_digest',
  'report',
  'snooze_ending',
]
const NEW_MAIL_KINDS = ['incident_raised', 'incident_reopened', 'site_incident_opened', 'site_incident_escalated']
const kindCheck = (kinds: string[]) =>
  `ALTER TABLE mail_outbox DROP CONSTRAINT mail_outbox_kind_check, ADD CONSTRAINT mail_outbox_kind_check CHECK (kind IN (${kinds.map((k) => `'${k}'`).join(', ')}));`

// One fault, one incident. An incident now carries its flaps and the times that defer its mails:
// the all-clear waits out the rule's settle window (a trip inside it reopens the same incident),
// a reopened one is mailed again only if it is still tripped at `recheck_at`, and the first mail
// waits until `notify_at` in case the fault turns out to be site-wide. A site incident gathers the
// tanks' own incidents of one cause; a maintenance window silences a site, a tank or a rule.
const up = `
CREATE TABLE site_incidents (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  cause text NOT NULL,
  severity text NOT NULL CHECK (severity IN ('warning', 'alarm')),
  title text NOT NULL,
  state text NOT NULL CHECK (state IN ('open', 'acknowledged', 'resolved')),
  opened_at timestamptz NOT NULL,
  acknowledged_at timestamptz,
  acknowledged_by integer REFERENCES users(id) ON DELETE SET NULL,
  resolved_at timestamptz,
  escalation_level integer NOT NULL DEFAULT 0,
  next_escalation_at timestamptz,
  notify_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX site_incidents_site ON site_incidents (site_id, state, opened_at DESC);
CREATE INDEX site_incidents_due ON site_incidents (next_escalation_at, notify_at) WHERE state <> 'resolved';

ALTER TABLE incidents
  ADD COLUMN top_severity text NOT NULL DEFAULT 'warning' CHECK (top_severity IN ('warning', 'alarm')),
  ADD COLUMN flap_count integer NOT NULL DEFAULT 0,
  ADD COLUMN last_flap_at timestamptz,
  ADD COLUMN settle_until timestamptz,
  ADD COLUMN all_clear_at timestamptz,
  ADD COLUMN recheck_at timestamptz,
  ADD COLUMN notify_at timestamptz,
  ADD COLUMN maintenance boolean NOT NULL DEFAULT false,
  ADD COLUMN cause text,
  ADD COLUMN site_incident_id integer REFERENCES site_incidents(id) ON DELETE SET NULL;
UPDATE incidents SET top_severity = severity;
CREATE INDEX incidents_site_incident ON incidents (site_incident_id) WHERE site_incident_id IS NOT NULL;
CREATE INDEX incidents_settling ON incidents (tank_id, settle_until) WHERE state = 'resolved' AND settle_until IS NOT NULL;
-- The engine looks for these on every tick: partial indexes keep that cheap however many incidents pile up.
CREATE INDEX incidents_notify_due ON incidents (notify_at) WHERE notify_at IS NOT NULL;
CREATE INDEX incidents_recheck_due ON incidents (recheck_at) WHERE recheck_at IS NOT NULL;
CREATE INDEX incidents_all_clear_due ON incidents (all_clear_at) WHERE all_clear_at IS NOT NULL;
CREATE INDEX incidents_in_maintenance ON incidents (id) WHERE maintenance AND state <> 'resolved';

-- One-off (starts_at..ends_at) or weekly (weekday 0 = Monday, as the roster, start_minute after local midnight,
-- duration_minutes) in the site's own zone, so a window stays at 09:00 across clock changes.
CREATE TABLE maintenance_windows (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  tank_id integer REFERENCES tanks(id) ON DELETE CASCADE,
  rule_id integer REFERENCES watch_rules(id) ON DELETE CASCADE,
  reason text NOT NULL,
  starts_at timestamptz,
  ends_at timestamptz,
  weekday smallint CHECK (weekday BETWEEN 0 AND 6),
  start_minute smallint CHECK (start_minute BETWEEN 0 AND 1439),
  duration_minutes integer CHECK (duration_minutes BETWEEN 1 AND 1440),
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  cancelled_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (
    (starts_at IS NOT NULL AND ends_at > starts_at AND weekday IS NULL AND start_minute IS NULL AND duration_minutes IS NULL)
    OR (starts_at IS NULL AND ends_at IS NULL AND weekday IS NOT NULL AND start_minute IS NOT NULL AND duration_minutes IS NOT NULL)
  )
);
CREATE INDEX maintenance_windows_site ON maintenance_windows (site_id) WHERE cancelled_at IS NULL;
${kindCheck([...OLD_MAIL_KINDS, ...NEW_MAIL_KINDS])}
`

const down = `
${kindCheck(OLD_MAIL_KINDS)}
DROP TABLE maintenance_windows;
DROP INDEX incidents_in_maintenance, incidents_all_clear_due, incidents_recheck_due, incidents_notify_due, incidents_settling;
DROP INDEX incidents_site_incident;
ALTER TABLE incidents DROP COLUMN site_incident_id, DROP COLUMN cause, DROP COLUMN maintenance, DROP COLUMN notify_at,
  DROP COLUMN recheck_at, DROP COLUMN all_clear_at, DROP COLUMN settle_until, DROP COLUMN last_flap_at, DROP COLUMN flap_count, DROP COLUMN top_severity;
DROP TABLE site_incidents;
`

const migration: Migration = {
  name: '202612050200-add-incident-flaps-sites-maintenance',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
