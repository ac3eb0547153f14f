import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import addCalibrations from '../../server/platform/db/migrations/202612060100-add-calibrations'
import { startTestApp } from '../helpers/app'
import { createTankWithDevice } from '../helpers/fixtures'

let t: Awaited<ReturnType<typeof startTestApp>>
beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())

describe('the calibration migration', () => {
  it('gives probes registered before it the rules and the care task a new probe brings, once, and rolls back cleanly', async () => {
    const org = await t.createOrg('Migrated Org')
    // Made straight in the tables, as before the migration: no rules, no care task.
    const node = await createTankWithDevice(t.ctx, org, 'Older probe tank')
    const qi = t.ctx.sequelize.getQueryInterface()
    await addCalibrations.down(qi)
    await addCalibrations.up(qi)
    const rules = await t.ctx.sequelize.query<{ name: string; spec: { kind: string; metric: string; tolerance?: number } }>(
      `SELECT name, spec FROM watch_rules WHERE tank_id = $1 ORDER BY name`,
      { bind: [node.tankId], type: QueryTypes.SELECT },
    )
    // The fixture's device reports temperature, pH, light and water level: probe rules for the first two.
    expect(rules.map((r) => r.name)).toEqual([
      'Temperature probe disagrees with the test kit',
      'Temperature probe may be frozen or out of the water',
      'pH probe disagrees with the test kit',
      'pH probe may be frozen or out of the water',
    ])
    expect(rules.find((r) => r.spec.kind === 'probe_kit' && r.spec.metric === 'ph')!.spec.tolerance).toBe(0.2)
    const tasks = await t.ctx.sequelize.query<{ title: string; device_id: number }>(`SELECT title, device_id FROM care_tasks WHERE tank_id = $1`, {
      bind: [node.tankId],
      type: QueryTypes.SELECT,
    })
    expect(tasks).toEqual([{ title: 'Calibrate the pH probe (Older probe tank node)', device_id: node.deviceId }])
  })
})
