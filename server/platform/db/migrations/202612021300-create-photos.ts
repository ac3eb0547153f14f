import type { Migration } from './migration'

// The image bytes live in the photo store; a row names its two generated keys.
const up = `
CREATE TABLE photos (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  care_log_entry_id integer REFERENCES care_log(id) ON DELETE SET NULL,
  caption text NOT NULL DEFAULT '' CHECK (length(caption) <= 500),
  taken_at timestamptz NOT NULL,
  uploaded_by integer REFERENCES users(id) ON DELETE SET NULL,
  content_type text NOT NULL CHECK (content_type IN ('image/jpeg')),
  display_key text NOT NULL UNIQUE,
  display_width integer NOT NULL CHECK (display_width > 0),
  display_height integer NOT NULL CHECK (display_height > 0),
  display_bytes integer NOT NULL CHECK (display_bytes > 0),
  thumbnail_key text NOT NULL UNIQUE,
  thumbnail_width integer NOT NULL CHECK (thumbnail_width > 0),
  thumbnail_height integer NOT NULL CHECK (thumbnail_height > 0),
  original_format text NOT NULL CHECK (original_format IN ('jpeg', 'png', 'webp')),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX photos_tank_taken ON photos (tank_id, taken_at);
CREATE INDEX photos_care_log_entry ON photos (care_log_entry_id) WHERE care_log_entry_id IS NOT NULL;
`

const migration: Migration = {
  name: '202612021300-create-photos',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query('DROP TABLE photos;')),
}
export default migration
