import type { Migration } from './migration'

// Probe calibrations per device and metric, the devices that calibrate themselves, and beside each
// stored reading the value the device sent and the calibration that corrected it. Readings name
// their calibration without a foreign key: a calibration is never deleted, and a key would add an
// index lookup to every batch insert.
const up = `
CREATE TABLE calibrations (
  id serial PRIMARY KEY,
  organization_id integer NOT NULL REFERENCES organizations(id) ON DELETE CASCADE,
  device_id integer NOT NULL REFERENCES devices(id) ON DELETE CASCADE,
  metric text NOT NULL,
  method text NOT NULL CHECK (method IN ('ph_buffers', 'offset', 'factor')),
  points jsonb NOT NULL,
  gain double precision NOT NULL,
  intercept double precision NOT NULL,
  slope_percent double precision,
  offset_mv double precision,
  slope_ok boolean,
  performed_at timestamptz NOT NULL,
  performed_by integer REFERENCES users(id) ON DELETE SET NULL,
  notes text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX calibrations_device_metric ON calibrations (device_id, metric, performed_at DESC, id DESC);
ALTER TABLE devices ADD COLUMN self_calibrating boolean NOT NULL DEFAULT false;
ALTER TABLE readings ADD COLUMN raw_value double precision, ADD COLUMN calibration_id integer;
-- A care task that belongs to one probe ("calibrate the pH probe"): recording its calibration ticks it off.
ALTER TABLE care_tasks ADD COLUMN device_id integer REFERENCES devices(id) ON DELETE CASCADE;
CREATE INDEX care_tasks_device ON care_tasks (device_id) WHERE device_id IS NOT NULL;
`
const down = `
ALTER TABLE care_tasks DROP COLUMN device_id;
ALTER TABLE readings DROP COLUMN raw_value, DROP COLUMN calibration_id;
ALTER TABLE devices DROP COLUMN self_calibrating;
DROP TABLE calibrations;
`

const migration: Migration = {
  name: '202612060100-add-calibrations',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
