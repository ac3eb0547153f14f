import { QueryTypes, type Sequelize } from 'sequelize'

type Row = { id: number; metric: string; gain: number; intercept: number }

/**
 * The newest calibration of each metric of one device, as ingest applies it; none for a device
 * that calibrates itself.
 */
export async function currentCorrections(sequelize: Sequelize, deviceId: number) {
  const rows = await sequelize.query<Row>(
    `SELECT DISTINCT ON (c.metric) c.id, c.metric, c.gain, c.intercept
     FROM calibrations c JOIN devices d ON d.id = c.device_id
     WHERE c.device_id = $1 AND NOT d.self_calibrating
     ORDER BY c.metric, c.performed_at DESC, c.id DESC`,
    { bind: [deviceId], type: QueryTypes.SELECT },
  )
  return new Map(rows.map((r) => [r.metric, { calibrationId: r.id, gain: r.gain, intercept: r.intercept }]))
}
