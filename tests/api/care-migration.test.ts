import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import createCare from '../../server/platform/db/migrations/202612020410-create-care'
import { migrations } from '../../server/platform/db/migrations'
import { startTestApp } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())

const careTables = async () =>
  (
    await t.ctx.sequelize.query<{ name: string }>(
      `SELECT c.relname::text AS name FROM pg_class c WHERE c.relkind = 'r' AND c.relname IN ('care_tasks', 'care_log', 'livestock', 'water_changes') ORDER BY 1`,
      { type: QueryTypes.SELECT },
    )
  ).map((r) => r.name)

describe('the care migration', () => {
  it('rolls back cleanly, with every migration after it, and applies again', async () => {
    const qi = t.ctx.sequelize.getQueryInterface()
    // Later migrations build on the care tables (photos point at care-log entries), so they go first.
    const fromCare = migrations.slice(migrations.indexOf(createCare))
    expect(await careTables()).toEqual(['care_log', 'care_tasks', 'livestock', 'water_changes'])
    for (const m of [...fromCare].reverse()) await m.down(qi)
    expect(await careTables()).toEqual([])
    for (const m of fromCare) await m.up(qi)
    expect(await careTables()).toEqual(['care_log', 'care_tasks', 'livestock', 'water_changes'])
  })
})
