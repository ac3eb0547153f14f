import type { Migration } from './migration'

const up = `
-- Recurring care work on one tank. recurrence: {"kind":"interval","everyDays":7} or
-- {"kind":"weekdays","weekdays":[0,3]} (0 = Monday), read on the site's calendar.
CREATE TABLE care_tasks (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'substrate_clean', 'test_kit_check', 'other')),
  title text NOT NULL,
  recurrence jsonb NOT NULL,
  default_values jsonb NOT NULL DEFAULT '{}',
  starts_on date,
  last_done_at timestamptz,
  last_done_by integer REFERENCES users(id) ON DELETE SET NULL,
  snoozed_until timestamptz,
  snooze_reason text,
  active boolean NOT NULL DEFAULT true,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (snoozed_until IS NULL OR snooze_reason IS NOT NULL)
);
CREATE INDEX care_tasks_tank ON care_tasks (tank_id);

CREATE TABLE water_changes (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  status text NOT NULL CHECK (status IN ('in_progress', 'finished')),
  plan jsonb NOT NULL,
  heater_off_confirmed boolean NOT NULL,
  temporary_rule_id integer REFERENCES watch_rules(id) ON DELETE SET NULL,
  started_at timestamptz NOT NULL,
  started_by integer REFERENCES users(id) ON DELETE SET NULL,
  finished_at timestamptz,
  finished_by integer REFERENCES users(id) ON DELETE SET NULL,
  litres_replaced double precision CHECK (litres_replaced > 0),
  dechlorinator_ml double precision CHECK (dechlorinator_ml >= 0),
  new_water_temp_c double precision,
  care_log_entry_id integer,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((status = 'finished') = (finished_at IS NOT NULL))
);
-- One change in progress per tank at a time.
CREATE UNIQUE INDEX water_changes_one_open ON water_changes (tank_id) WHERE status = 'in_progress';

-- What was done to a tank and when; the chart markers of the tank page.
CREATE TABLE care_log (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('water_change', 'dosing', 'livestock_in', 'livestock_out', 'equipment', 'media_change', 'note', 'task_done')),
  at timestamptz NOT NULL,
  user_id integer REFERENCES users(id) ON DELETE SET NULL,
  text text NOT NULL DEFAULT '',
  values jsonb NOT NULL DEFAULT '{}',
  care_task_id integer REFERENCES care_tasks(id) ON DELETE SET NULL,
  water_change_id integer REFERENCES water_changes(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX care_log_tank_at ON care_log (tank_id, at);
ALTER TABLE water_changes ADD FOREIGN KEY (care_log_entry_id) REFERENCES care_log(id) ON DELETE SET NULL;

CREATE TABLE livestock (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  species_key text,
  name text NOT NULL,
  category text NOT NULL CHECK (category IN ('fish', 'invertebrate', 'plant')),
  count integer NOT NULL CHECK (count >= 0),
  losses integer NOT NULL DEFAULT 0 CHECK (losses >= 0),
  added_at timestamptz NOT NULL,
  source text NOT NULL DEFAULT '',
  notes text NOT NULL DEFAULT '',
  removed_at timestamptz,
  watch_until timestamptz,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX livestock_tank ON livestock (tank_id, added_at);
`

const down = `DROP TABLE livestock; ALTER TABLE water_changes DROP COLUMN care_log_entry_id; DROP TABLE care_log; DROP TABLE water_changes; DROP TABLE care_tasks;`

const migration: Migration = {
  name: '202612020410-create-care',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
