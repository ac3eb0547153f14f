import type { Migration } from './migration'

const KINDS = [
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

const up = `
-- Transactional outbox: a mail is a row written in the same transaction as the change it reports,
-- and a sender delivers it later. dedupe_key names the logical mail, so it is enqueued once.
CREATE TABLE mail_outbox (
  id serial PRIMARY KEY,
  organization_id integer REFERENCES organizations(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN (${KINDS.map((k) => `'${k}'`).join(', ')})),
  to_address text NOT NULL,
  subject text NOT NULL,
  text_body text NOT NULL,
  html_body text,
  attachments jsonb NOT NULL DEFAULT '[]',
  incident_id integer,
  dedupe_key text NOT NULL UNIQUE,
  status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sending', 'sent', 'failed')),
  attempts integer NOT NULL DEFAULT 0,
  next_attempt_at timestamptz NOT NULL DEFAULT now(),
  last_error text,
  sent_at timestamptz,
  smtp_message_id text,
  created_at timestamptz NOT NULL DEFAULT now(),
  -- While status = 'sending', updated_at is the moment the row was claimed.
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX mail_outbox_due ON mail_outbox (status, next_attempt_at);
CREATE INDEX mail_outbox_incident ON mail_outbox (incident_id);
CREATE INDEX mail_outbox_organization ON mail_outbox (organization_id);

-- What the local fake SMTP server received (development and tests only).
CREATE TABLE fake_mailbox (
  id serial PRIMARY KEY,
  received_at timestamptz NOT NULL DEFAULT now(),
  organization_id integer,
  envelope_from text,
  envelope_to text[] NOT NULL DEFAULT '{}',
  subject text,
  text_body text,
  html_body text,
  headers jsonb NOT NULL DEFAULT '{}',
  attachments jsonb NOT NULL DEFAULT '[]',
  raw_size integer NOT NULL
);
CREATE INDEX fake_mailbox_received ON fake_mailbox (received_at DESC);
`

const down = `DROP TABLE fake_mailbox; DROP TABLE mail_outbox;`

const migration: Migration = {
  name: '202612020330-create-mail-outbox',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
