import type { Migration } from './migration'

// A medication course on a tank (most often in quarantine): the product label's dose and days, the
// tests it calls for; its daily dose and test tasks are care tasks that stop on the course's last day.
const up = `
CREATE TABLE treatment_courses (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  product text NOT NULL,
  dose jsonb NOT NULL,
  days integer NOT NULL CHECK (days BETWEEN 1 AND 90),
  dose_every_days integer NOT NULL DEFAULT 1 CHECK (dose_every_days >= 1),
  starts_on date NOT NULL,
  ends_on date NOT NULL,
  tests jsonb NOT NULL DEFAULT '[]',
  notes text NOT NULL DEFAULT '',
  stopped_at timestamptz,
  stopped_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (ends_on >= starts_on)
);
CREATE INDEX treatment_courses_tank ON treatment_courses (tank_id, ends_on);
ALTER TABLE care_tasks ADD COLUMN ends_on date;
ALTER TABLE care_tasks ADD COLUMN treatment_course_id integer REFERENCES treatment_courses(id) ON DELETE CASCADE;
ALTER TABLE care_tasks DROP CONSTRAINT care_tasks_kind_check;
ALTER TABLE care_tasks ADD CONSTRAINT care_tasks_kind_check
  CHECK (kind IN ('water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'substrate_clean', 'test_kit_check', 'treatment_dose', 'treatment_test', 'other'));
CREATE INDEX care_tasks_treatment_course ON care_tasks (treatment_course_id) WHERE treatment_course_id IS NOT NULL;
`
const down = `
DELETE FROM care_tasks WHERE kind IN ('treatment_dose', 'treatment_test');
ALTER TABLE care_tasks DROP CONSTRAINT care_tasks_kind_check;
ALTER TABLE care_tasks ADD CONSTRAINT care_tasks_kind_check
  CHECK (kind IN ('water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'substrate_clean', 'test_kit_check', 'other'));
ALTER TABLE care_tasks DROP COLUMN treatment_course_id;
ALTER TABLE care_tasks DROP COLUMN ends_on;
DROP TABLE treatment_courses;
`

const migration: Migration = {
  name: '202612060200-create-treatment-courses',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
