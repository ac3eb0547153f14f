import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/app'
import { as, badFields, isoDaysAgo, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// The 28-day quarantine and the half-unit pH gap are `common practice` (shared/care/livestock.ts,
// shared/livestock/move-check.ts). The mixing estimate averages [H⁺] (pH = −log₁₀ a(H⁺), IUPAC
// Compendium of Chemical Terminology), worked by hand below. Counts are made up.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Batches Org')
  other = await t.createOrg('Other Batches Org')
})
afterAll(() => t.close())

const api = () => t.api()
const arrive = async (tankId: number, body: object) => {
  const res = await api().post(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'keeper')).send(body)
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.entry.id as number
}
const batch = async (id: number) => (await api().get(`/api/v1/livestock/batches/${id}`).set(as(org, 'viewer'))).body
const post = (path: string, body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  api().post(`/api/v1/livestock/batches/${path}`).set(as(org, role)).send(body)

async function openIncident(tankId: number, title: string) {
  const at = new Date()
  await t.ctx.models.Incident.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0] as number,
    tankId,
    ruleId: null,
    ruleKind: 'above',
    metric: 'temperature',
    severity: 'alarm',
    title,
    state: 'open',
    conditionSince: at,
    openedAt: at,
    firstValue: 29,
    peakValue: 29,
    latestValue: 29,
    latestAt: at,
  })
}

describe('a batch from quarantine to sales to sold', () => {
  it('keeps counts that add up, the tanks it lived in and every step', async () => {
    const quarantine = await newTank(t, org, { name: 'Q1', stage: 'quarantine' })
    const sales = await newTank(t, org, { name: 'Sales 2' })
    const display = await newTank(t, org, { name: 'Display' })
    const id = await arrive(quarantine, { speciesKey: 'zebra_danio', count: 30, source: 'Riverside Wholesale', addedAt: isoDaysAgo(10) })

    const first = await batch(id)
    expect(first).toMatchObject({ supplier: 'Riverside Wholesale', count: 30, alive: 30, daysSinceArrival: 10, tank: { name: 'Q1' } })
    // Quarantine counted from the batch's arrival ten days ago: day 10 of 28, 18 to go.
    expect(first.quarantine).toMatchObject({ daysIn: 10, daysRemaining: 18, days: 28 })

    expect((await post(`${id}/losses`, { count: 2, cause: 'Whitespot, treated' })).body).toMatchObject({ losses: 2, alive: 28 })
    // Part of the batch moves on: a new batch in the sales tank, split from the first.
    const moved = await post(`${id}/move`, { toTankId: sales, count: 20 })
    expect(moved.status, JSON.stringify(moved.body)).toBe(200)
    expect(moved.body.warnings).toEqual([])
    expect(moved.body.from).toMatchObject({ id, count: 30, losses: 2, movedOut: 20, alive: 8 })
    const salesBatch = moved.body.moved
    expect(salesBatch).toMatchObject({ parentId: id, count: 20, alive: 20, tank: { name: 'Sales 2' }, supplier: 'Riverside Wholesale', quarantine: null })
    expect(salesBatch.arrivedAt).toBe(first.arrivedAt)

    expect(badFields(await post(`${salesBatch.id}/out`, { outcome: 'sold', count: 21 }))).toEqual(['count'])
    expect((await post(`${salesBatch.id}/losses`, { count: 1, cause: 'Jumped' })).body.alive).toBe(19)
    expect((await post(`${salesBatch.id}/out`, { outcome: 'sold', count: 12, destination: 'Walk-in customer' })).body).toMatchObject({
      alive: 7,
      closedAt: null,
    })
    expect((await post(`${salesBatch.id}/out`, { outcome: 'to_client', destination: 'Harbour Dental, lobby tank' })).body).toMatchObject({
      count: 20,
      losses: 1,
      movedOut: 19,
      alive: 0,
    })
    // The rest of the quarantine batch goes to display whole: the same batch, in its new tank.
    const whole = await post(`${id}/move`, { toTankId: display })
    expect(whole.body.moved).toMatchObject({ id, tank: { name: 'Display' }, alive: 8 })

    const sold = await batch(salesBatch.id)
    expect(sold.closedAt).not.toBeNull()
    expect(sold.tanks.map((x: { name: string }) => x.name)).toEqual(['Q1', 'Sales 2'])
    expect(sold.history.map((e: { kind: string; count: number }) => [e.kind, e.count])).toEqual([
      ['arrived', 30],
      ['lost', 2],
      ['moved', 20],
      ['lost', 1],
      ['sold', 12],
      ['to_client', 7],
    ])
    expect(sold.history[1].cause).toBe('Whitespot, treated')
    expect(sold.history[5].destination).toBe('Harbour Dental, lobby tank')
    // Every animal accounted for across both batches: 30 in = 3 lost + 12 sold + 7 to a client + 8 on display.
    const rest = await batch(id)
    expect(rest.losses + sold.losses + 12 + 7 + rest.alive).toBe(30)
    expect(rest.tanks.map((x: { name: string }) => x.name)).toEqual(['Q1', 'Display'])
    expect(rest.history.map((e: { kind: string }) => e.kind)).toEqual(['arrived', 'lost', 'moved', 'moved'])

    const log = await api().get(`/api/v1/tanks/${sales}/care-log`).set(as(org, 'viewer'))
    expect(log.body.map((e: { text: string }) => e.text)).toEqual([
      "7 × Zebra danio moved to a client's tank (Harbour Dental, lobby tank)",
      '12 × Zebra danio sold (Walk-in customer)',
      '1 × Zebra danio lost: Jumped',
      'Moved in 20 × Zebra danio from Q1',
    ])
  })

  it('counts stock per tank, per site and per species, as a table and as CSV', async () => {
    const site = org.siteIds[1] ?? (org.siteIds[0] as number)
    const a = await newTank(t, org, { name: 'Stock A' }, site)
    await arrive(a, { speciesKey: 'zebra_danio', count: 6 })
    await arrive(a, { name: '=Mystery tetra', category: 'fish', count: 4 })
    const byTank = (await api().get('/api/v1/livestock/stock?by=tank').set(as(org, 'viewer'))).body
    expect(byTank.find((r: { label: string }) => r.label === 'Stock A')).toMatchObject({ batches: 2, alive: 10 })
    const bySpecies = (await api().get('/api/v1/livestock/stock?by=species').set(as(org, 'viewer'))).body
    // 8 on display from the first test plus 6 here.
    expect(bySpecies.find((r: { speciesKey: string }) => r.speciesKey === 'zebra_danio')).toMatchObject({ alive: 14, label: 'Zebra danio' })
    const csv = await api().get('/api/v1/livestock/stock.csv?by=species').set(as(org, 'viewer'))
    expect(csv.status).toBe(200)
    expect(csv.headers['content-type']).toMatch(/text\/csv/)
    expect(csv.text.split('\r\n')).toContain('Zebra danio,2,14')
    // A name a spreadsheet would run as a formula stays text.
    expect(csv.text).toContain("'=Mystery tetra,1,4")
    expect(badFields(await api().get('/api/v1/livestock/stock?by=colour').set(as(org, 'viewer')))).toEqual(['by'])
    expect((await api().get('/api/v1/livestock/stock').set(as(other, 'owner'))).body).toEqual([])
  })
})

describe('moving into a tank that needs a look first', () => {
  it('warns of an open incident and a pH far off, and moves only when confirmed', async () => {
    const from = await newTank(t, org, { name: 'Hard water', targets: { ph: { min: 7.6, max: 8.0 } } })
    const to = await newTank(t, org, { name: 'Soft water', targets: { ph: { min: 6.2, max: 6.6 } } })
    await openIncident(to, 'Temperature above 28 °C')
    const id = await arrive(from, { speciesKey: 'zebra_danio', count: 10 })

    const refused = await post(`${id}/move`, { toTankId: to, count: 4 })
    expect(refused.status).toBe(409)
    expect(refused.body.error.code).toBe('confirm_needed')
    const warnings = refused.body.error.details.warnings
    expect(warnings.map((w: { code: string }) => w.code)).toEqual(['open_incident', 'ph_gap'])
    expect(warnings[0].message).toBe('Soft water has an open incident: Temperature above 28 °C')
    // pH 7.8 (middle of 7.6–8.0) against 6.4: one to one at the end, −log₁₀((10^−7.8 + 10^−6.4) / 2) = 6.68.
    expect(warnings[1].message).toBe(
      'pH 7.8 here, 6.4 in Soft water (1.4 apart): acclimate over 30 minutes; the container reads about pH 6.7 when the animals are netted across',
    )
    expect((await batch(id)).alive).toBe(10)

    const done = await post(`${id}/move`, { toTankId: to, count: 4, confirm: true })
    expect(done.status).toBe(200)
    expect(done.body.warnings).toHaveLength(2)
    expect(done.body.moved).toMatchObject({ count: 4, tank: { name: 'Soft water' } })
    expect((await batch(id)).alive).toBe(6)
  })

  it('refuses bad moves, viewers and strangers', async () => {
    const tank = await newTank(t, org)
    const id = await arrive(tank, { speciesKey: 'zebra_danio', count: 3 })
    expect(badFields(await post(`${id}/move`, { toTankId: tank }))).toEqual(['toTankId'])
    expect(badFields(await post(`${id}/move`, { toTankId: await newTank(t, org), count: 4 }))).toEqual(['count'])
    expect(badFields(await post(`${id}/losses`, { count: 1 }))).toEqual(['cause'])
    expect(badFields(await post(`${id}/out`, { outcome: 'to_client' }))).toEqual(['destination'])
    expect((await post(`${id}/losses`, { count: 1, cause: 'x' }, 'viewer')).status).toBe(403)
    const theirs = await newTank(t, other)
    expect((await post(`${id}/move`, { toTankId: theirs })).status).toBe(404)
    expect((await api().get(`/api/v1/livestock/batches/${id}`).set(as(other, 'owner'))).status).toBe(404)
  })
})

describe('ids beyond what the database holds', () => {
  it('are refused as bad input, not a server error', async () => {
    const tank = await newTank(t, org)
    const id = await arrive(tank, { speciesKey: 'zebra_danio', count: 2 })
    expect(badFields(await post(`${id}/move`, { toTankId: 2 ** 40 }))).toEqual(['toTankId'])
    expect(
      badFields(
        await api()
          .get(`/api/v1/livestock/stock?siteId=${2 ** 40}`)
          .set(as(org, 'viewer')),
      ),
    ).toEqual(['siteId'])
    expect(
      badFields(
        await api()
          .get(`/api/v1/livestock/batches?tankId=${2 ** 40}`)
          .set(as(org, 'viewer')),
      ),
    ).toEqual(['tankId'])
  })
})
