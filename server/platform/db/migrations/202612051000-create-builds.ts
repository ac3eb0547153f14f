import type { Migration } from './migration'

const up = `
-- A tank's build: the plan (equipment, substrate, hardscape, water, stocking) and, once filled,
-- its dated steps. One build per tank; each step may carry the care task that puts it on the rota.
CREATE TABLE tank_builds (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  tank_id integer NOT NULL UNIQUE REFERENCES tanks(id) ON DELETE CASCADE,
  plan jsonb NOT NULL,
  filled_on date,
  finished_at timestamptz,
  created_by integer REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX tank_builds_organization ON tank_builds (organization_id);

CREATE TABLE build_steps (
  id serial PRIMARY KEY,
  build_id integer NOT NULL REFERENCES tank_builds(id) ON DELETE CASCADE,
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  key text NOT NULL,
  title text NOT NULL,
  day integer NOT NULL CHECK (day >= 1),
  until_day integer CHECK (until_day IS NULL OR until_day >= day),
  due_on date NOT NULL,
  care_task_id integer REFERENCES care_tasks(id) ON DELETE SET NULL,
  done_at timestamptz,
  done_by integer REFERENCES users(id) ON DELETE SET NULL,
  notes text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (build_id, key)
);
CREATE INDEX build_steps_tank ON build_steps (tank_id);
`

const migration: Migration = {
  name: '202612051000-create-builds',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query('DROP TABLE build_steps; DROP TABLE tank_builds')),
}
export default migration
