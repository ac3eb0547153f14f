import type { Migration } from './migration'

const CHANNEL = `text NOT NULL DEFAULT 'mail' CHECK`

const up = `
-- A browser (phone, tablet, desktop) that may show a person's alerts: its push service endpoint and
-- the keys the payload is encrypted to. An endpoint the push service says is gone stays listed as
-- expired, so its owner sees why it went quiet, until they remove it.
CREATE TABLE push_subscriptions (
  id serial PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  endpoint text NOT NULL UNIQUE,
  p256dh text NOT NULL,
  auth text NOT NULL,
  label text NOT NULL,
  status text NOT NULL DEFAULT 'active' CHECK (status IN ('active', 'expired')),
  expired_at timestamptz,
  last_sent_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX push_subscriptions_user ON push_subscriptions (user_id);

-- How each person wants alerts of each severity: mail, phone or both (no row: mail).
CREATE TABLE alert_channels (
  user_id integer PRIMARY KEY REFERENCES users(id) ON DELETE CASCADE,
  warning ${CHANNEL} (warning IN ('mail', 'phone', 'both')),
  alarm ${CHANNEL} (alarm IN ('mail', 'phone', 'both')),
  updated_at timestamptz NOT NULL DEFAULT now()
);

-- The mail outbox's design for pushes: written in the incident's transaction, delivered later by a
-- sender that claims rows with SKIP LOCKED and retries with backoff; dedupe_key names the logical push.
-- 'gone': the push service said the subscription no longer exists, so it is not tried again.
CREATE TABLE push_outbox (
  id serial PRIMARY KEY,
  organization_id integer REFERENCES organizations(id) ON DELETE CASCADE,
  subscription_id integer REFERENCES push_subscriptions(id) ON DELETE CASCADE,
  user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  kind text NOT NULL,
  incident_id integer,
  payload jsonb NOT NULL,
  urgency text NOT NULL DEFAULT 'normal' CHECK (urgency IN ('very-low', 'low', 'normal', 'high')),
  topic text,
  dedupe_key text NOT NULL UNIQUE,
  status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sending', 'sent', 'failed', 'gone')),
  attempts integer NOT NULL DEFAULT 0,
  next_attempt_at timestamptz NOT NULL DEFAULT now(),
  last_error text,
  sent_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  -- While status = 'sending', updated_at is the moment the row was claimed.
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX push_outbox_due ON push_outbox (status, next_attempt_at);
CREATE INDEX push_outbox_incident ON push_outbox (incident_id);
`

const down = `DROP TABLE push_outbox; DROP TABLE alert_channels; DROP TABLE push_subscriptions;`

const migration: Migration = {
  name: '202612060400-create-push',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
