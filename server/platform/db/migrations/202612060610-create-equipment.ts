import type { Migration } from './migration'

// A tank's equipment (heaters, lamps, pumps, filters, probes) with its service interval, whose
// due services are care tasks of kind equipment_service; a site's consumables (filter media,
// carbon, salt, test-kit reagents) that care tasks draw down when they are done.
const up = `
CREATE TABLE equipment (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('heater', 'lamp', 'pump', 'filter', 'probe')),
  name text NOT NULL,
  model text NOT NULL DEFAULT '',
  watts double precision CHECK (watts > 0),
  installed_on date NOT NULL,
  service_action text NOT NULL CHECK (service_action IN ('replace', 'service', 'check')),
  service_every_days integer CHECK (service_every_days BETWEEN 1 AND 3650),
  care_task_id integer REFERENCES care_tasks(id) ON DELETE SET NULL,
  notes text NOT NULL DEFAULT '',
  retired_at timestamptz,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX equipment_tank ON equipment (tank_id);

CREATE TABLE consumables (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  site_id integer NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
  kind text NOT NULL CHECK (kind IN ('filter_media', 'carbon', 'salt', 'reagent', 'other')),
  name text NOT NULL,
  unit text NOT NULL,
  quantity double precision NOT NULL CHECK (quantity >= 0),
  low_at double precision CHECK (low_at >= 0),
  expires_on date,
  notes text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX consumables_site ON consumables (site_id);

ALTER TABLE care_tasks DROP CONSTRAINT care_tasks_kind_check;
ALTER TABLE care_tasks ADD CONSTRAINT care_tasks_kind_check
  CHECK (kind IN ('water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'substrate_clean', 'test_kit_check', 'treatment_dose', 'treatment_test', 'equipment_service', 'other'));
ALTER TABLE care_tasks ADD COLUMN consumable_id integer REFERENCES consumables(id) ON DELETE SET NULL;
ALTER TABLE care_tasks ADD COLUMN consumable_amount double precision CHECK (consumable_amount > 0);
`
const down = `
ALTER TABLE care_tasks DROP COLUMN consumable_amount;
ALTER TABLE care_tasks DROP COLUMN consumable_id;
DELETE FROM care_tasks WHERE kind = 'equipment_service';
ALTER TABLE care_tasks DROP CONSTRAINT care_tasks_kind_check;
ALTER TABLE care_tasks ADD CONSTRAINT care_tasks_kind_check
  CHECK (kind IN ('water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'substrate_clean', 'test_kit_check', 'treatment_dose', 'treatment_test', 'other'));
DROP TABLE consumables;
DROP TABLE equipment;
`

const migration: Migration = {
  name: '202612060610-create-equipment',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
