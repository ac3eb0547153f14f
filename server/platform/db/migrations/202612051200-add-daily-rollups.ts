import type { Migration } from './migration'

/*
 * Rollups now describe every reading before `rolled_up_before`, not only the pruned ones, so a long
 * chart reads hours or days instead of raw rows. Raw rows stay the truth from `raw_kept_from` on.
 *
 * - The retention job moves `rolled_up_before` forward over closed hours (server/services/retention.ts).
 * - A reading written into an already rolled-up hour (a back-dated test-kit entry, an import, a
 *   restore) is merged into its hour by the statement trigger on `readings`, in the same transaction.
 *   A statement whose rows are all less than 30 minutes older than its transaction takes the quick
 *   path: the job never rolls up an hour that ends later than 30 minutes before the oldest open
 *   transaction, so such rows cannot be in an hour it is closing. Any other statement takes the
 *   state row FOR SHARE, which the job holds FOR UPDATE while it rolls up.
 * - A deleted reading (a test-kit entry edited or removed) in a rolled-up hour whose raw rows are
 *   all kept has its hour recomputed from them. Before `raw_kept_from` a deletion is retention's
 *   own (or of a reading older than the raw window), and the rollup keeps it.
 * - Days are the sum of their hours: triggers on `readings_hourly` add a new or grown hour to its
 *   day (an upsert, so concurrent writers queue on the day's row) and recompute a day one of whose
 *   hours was removed, so each path that writes hours keeps days true.
 * - Deleting readings recomputes hours from raw rows, so two deletions in one tank's hours must not
 *   interleave: they take advisory lock 7411010 per tank, after the state row.
 * Hours and days are UTC, aligned like chart buckets (Monday 2000-01-03 00:00 UTC).
 */
const ORIGIN = `'2000-01-03T00:00:00Z'::timestamptz`

const up = `
CREATE TABLE readings_daily (
  tank_id integer NOT NULL REFERENCES tanks(id) ON DELETE CASCADE,
  metric text NOT NULL,
  day timestamptz NOT NULL,
  min double precision NOT NULL,
  max double precision NOT NULL,
  sum double precision NOT NULL,
  count integer NOT NULL,
  PRIMARY KEY (tank_id, metric, day)
);

CREATE TABLE readings_rollup_state (
  singleton boolean PRIMARY KEY DEFAULT true CHECK (singleton),
  rolled_up_before timestamptz NOT NULL,
  raw_kept_from timestamptz NOT NULL
);

-- Until now hourly rows held only pruned readings: raw rows were kept from the hour after the last one.
INSERT INTO readings_rollup_state (rolled_up_before, raw_kept_from)
SELECT date_bin(interval '1 hour', now() - interval '30 minutes', ${ORIGIN}),
       COALESCE((SELECT max(hour) + interval '1 hour' FROM readings_hourly), '-infinity');

INSERT INTO readings_hourly AS h (tank_id, metric, hour, min, max, sum, count)
SELECT tank_id, metric, date_bin(interval '1 hour', time, ${ORIGIN}), min(value), max(value), sum(value), count(*)
FROM readings
WHERE time < (SELECT rolled_up_before FROM readings_rollup_state)
GROUP BY 1, 2, 3
ON CONFLICT (tank_id, metric, hour) DO UPDATE SET
  min = LEAST(h.min, EXCLUDED.min), max = GREATEST(h.max, EXCLUDED.max),
  sum = h.sum + EXCLUDED.sum, count = h.count + EXCLUDED.count;

INSERT INTO readings_daily (tank_id, metric, day, min, max, sum, count)
SELECT tank_id, metric, date_bin(interval '1 day', hour, ${ORIGIN}), min(min), max(max), sum(sum), sum(count)
FROM readings_hourly
GROUP BY 1, 2, 3;

CREATE FUNCTION readings_rollup_lock_tanks(tank_ids integer[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  tank integer;
BEGIN
  FOR tank IN SELECT DISTINCT t FROM unnest(tank_ids) AS t ORDER BY 1 LOOP
    PERFORM pg_advisory_xact_lock(7411010, tank);
  END LOOP;
END $$;

CREATE FUNCTION readings_merge_into_hours() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  rolled_before timestamptz;
BEGIN
  IF NOT EXISTS (SELECT 1 FROM changed WHERE time < now() - interval '30 minutes') THEN
    RETURN NULL;
  END IF;
  SELECT rolled_up_before INTO rolled_before FROM readings_rollup_state FOR SHARE;
  INSERT INTO readings_hourly AS h (tank_id, metric, hour, min, max, sum, count)
  SELECT tank_id, metric, date_bin(interval '1 hour', time, ${ORIGIN}), min(value), max(value), sum(value), count(*)
  FROM changed
  WHERE time < rolled_before
  GROUP BY 1, 2, 3
  ON CONFLICT (tank_id, metric, hour) DO UPDATE SET
    min = LEAST(h.min, EXCLUDED.min), max = GREATEST(h.max, EXCLUDED.max),
    sum = h.sum + EXCLUDED.sum, count = h.count + EXCLUDED.count;
  RETURN NULL;
END $$;

CREATE FUNCTION readings_recompute_hours() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  state readings_rollup_state;
BEGIN
  IF NOT EXISTS (SELECT 1 FROM changed WHERE time < now() - interval '30 minutes') THEN
    RETURN NULL;
  END IF;
  SELECT * INTO state FROM readings_rollup_state FOR SHARE;
  PERFORM readings_rollup_lock_tanks(ARRAY(
    SELECT tank_id FROM changed WHERE time >= state.raw_kept_from AND time < state.rolled_up_before));
  DELETE FROM readings_hourly h
  USING (SELECT DISTINCT tank_id, metric, date_bin(interval '1 hour', time, ${ORIGIN}) AS hour
         FROM changed WHERE time >= state.raw_kept_from AND time < state.rolled_up_before) t
  WHERE h.tank_id = t.tank_id AND h.metric = t.metric AND h.hour = t.hour;
  INSERT INTO readings_hourly (tank_id, metric, hour, min, max, sum, count)
  SELECT t.tank_id, t.metric, t.hour, min(r.value), max(r.value), sum(r.value), count(*)
  FROM (SELECT DISTINCT tank_id, metric, date_bin(interval '1 hour', time, ${ORIGIN}) AS hour
        FROM changed WHERE time >= state.raw_kept_from AND time < state.rolled_up_before) t
  JOIN readings r ON r.tank_id = t.tank_id AND r.metric = t.metric AND r.time >= t.hour AND r.time < t.hour + interval '1 hour'
  GROUP BY 1, 2, 3;
  RETURN NULL;
END $$;

-- Hours added or grown are added to their days; the upsert's row lock orders concurrent writers.
CREATE FUNCTION readings_hours_added_to_days() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO readings_daily AS d (tank_id, metric, day, min, max, sum, count)
  SELECT tank_id, metric, date_bin(interval '1 day', hour, ${ORIGIN}), min(min), max(max), sum(sum), sum(count)
  FROM changed
  GROUP BY 1, 2, 3
  ON CONFLICT (tank_id, metric, day) DO UPDATE SET
    min = LEAST(d.min, EXCLUDED.min), max = GREATEST(d.max, EXCLUDED.max),
    sum = d.sum + EXCLUDED.sum, count = d.count + EXCLUDED.count;
  RETURN NULL;
END $$;

CREATE FUNCTION readings_hours_grown_in_days() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO readings_daily AS d (tank_id, metric, day, min, max, sum, count)
  SELECT a.tank_id, a.metric, date_bin(interval '1 day', a.hour, ${ORIGIN}), min(a.min), max(a.max), sum(a.sum - b.sum), sum(a.count - b.count)
  FROM grown a JOIN before_growing b USING (tank_id, metric, hour)
  GROUP BY 1, 2, 3
  ON CONFLICT (tank_id, metric, day) DO UPDATE SET
    min = LEAST(d.min, EXCLUDED.min), max = GREATEST(d.max, EXCLUDED.max),
    sum = d.sum + EXCLUDED.sum, count = d.count + EXCLUDED.count;
  RETURN NULL;
END $$;

-- A removed hour may have held a day's min or max: the day is recomputed from the hours left.
CREATE FUNCTION readings_hours_removed_from_days() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM readings_daily d
  USING (SELECT DISTINCT tank_id, metric, date_bin(interval '1 day', hour, ${ORIGIN}) AS day FROM changed) t
  WHERE d.tank_id = t.tank_id AND d.metric = t.metric AND d.day = t.day;
  INSERT INTO readings_daily (tank_id, metric, day, min, max, sum, count)
  SELECT t.tank_id, t.metric, t.day, min(h.min), max(h.max), sum(h.sum), sum(h.count)
  FROM (SELECT DISTINCT tank_id, metric, date_bin(interval '1 day', hour, ${ORIGIN}) AS day FROM changed) t
  JOIN readings_hourly h ON h.tank_id = t.tank_id AND h.metric = t.metric AND h.hour >= t.day AND h.hour < t.day + interval '1 day'
  GROUP BY 1, 2, 3;
  RETURN NULL;
END $$;

CREATE TRIGGER readings_merge_into_hours AFTER INSERT ON readings
  REFERENCING NEW TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION readings_merge_into_hours();
CREATE TRIGGER readings_recompute_hours AFTER DELETE ON readings
  REFERENCING OLD TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION readings_recompute_hours();
CREATE TRIGGER readings_hourly_inserted AFTER INSERT ON readings_hourly
  REFERENCING NEW TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION readings_hours_added_to_days();
CREATE TRIGGER readings_hourly_updated AFTER UPDATE ON readings_hourly
  REFERENCING OLD TABLE AS before_growing NEW TABLE AS grown FOR EACH STATEMENT EXECUTE FUNCTION readings_hours_grown_in_days();
CREATE TRIGGER readings_hourly_deleted AFTER DELETE ON readings_hourly
  REFERENCING OLD TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION readings_hours_removed_from_days();
`

const down = `
DROP TRIGGER readings_hourly_deleted ON readings_hourly;
DROP TRIGGER readings_hourly_updated ON readings_hourly;
DROP TRIGGER readings_hourly_inserted ON readings_hourly;
DROP TRIGGER readings_recompute_hours ON readings;
DROP TRIGGER readings_merge_into_hours ON readings;
DROP FUNCTION readings_hours_removed_from_days();
DROP FUNCTION readings_hours_grown_in_days();
DROP FUNCTION readings_hours_added_to_days();
DROP FUNCTION readings_recompute_hours();
DROP FUNCTION readings_merge_into_hours();
DROP FUNCTION readings_rollup_lock_tanks(integer[]);
-- Back to hourly rows of pruned readings only.
DELETE FROM readings_hourly WHERE hour >= (SELECT raw_kept_from FROM readings_rollup_state);
DROP TABLE readings_rollup_state;
DROP TABLE readings_daily;
`

const migration: Migration = {
  name: '202612051200-add-daily-rollups',
  up: async (qi) => void (await qi.sequelize.query(up)),
  down: async (qi) => void (await qi.sequelize.query(down)),
}
export default migration
