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

-- Probes registered before today get what a new probe brings (shared/rules/defaults.ts
-- defaultProbeRules, shared/calibration/care.ts), as they stood when this was written.
INSERT INTO watch_rules (organization_id, site_id, tank_id, name, severity, spec)
SELECT DISTINCT ON (d.tank_id, m.metric, r.kind) d.organization_id, t.site_id, d.tank_id, m.label || r.suffix, 'warning', r.spec
FROM devices d
JOIN tanks t ON t.id = d.tank_id
CROSS JOIN (VALUES
  ('ph', 'pH', 0.2, 0, 0.01),
  ('temperature', 'Temperature', 0.5, 0, 0.05),
  ('conductivity', 'Conductivity', 0, 5, 1)
) AS m(metric, label, tolerance, tolerance_percent, noise_floor)
CROSS JOIN LATERAL (VALUES
  ('probe_kit', ' probe disagrees with the test kit',
   jsonb_build_object('kind', 'probe_kit', 'metric', m.metric, 'tolerance', m.tolerance, 'tolerancePercent', m.tolerance_percent, 'withinMinutes', 15)),
  ('stuck', ' probe may be frozen or out of the water',
   jsonb_build_object('kind', 'stuck', 'metric', m.metric, 'flatMinutes', 180, 'noiseFloor', m.noise_floor))
) AS r(kind, suffix, spec)
WHERE d.revoked_at IS NULL AND m.metric = ANY(d.metrics)
  AND NOT EXISTS (SELECT 1 FROM watch_rules w WHERE w.tank_id = d.tank_id AND w.spec->>'kind' = r.kind AND w.spec->>'metric' = m.metric)
ORDER BY d.tank_id, m.metric, r.kind, d.id;

INSERT INTO care_tasks (organization_id, tank_id, kind, title, recurrence, device_id)
SELECT d.organization_id, d.tank_id, 'other', 'Calibrate the pH probe (' || d.name || ')', '{"kind":"interval","everyDays":28}', d.id
FROM devices d
WHERE d.revoked_at IS NULL AND 'ph' = ANY(d.metrics);
`
// Older code knows neither the probe rules' kinds nor a probe's care task: they go with it.
const down = `
DELETE FROM watch_rules WHERE spec->>'kind' IN ('probe_kit', 'stuck');
DELETE FROM care_tasks WHERE device_id IS NOT NULL;
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
