import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/app'
import { as, badFields, isoDaysAgo, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Species ranges are `from memory` (shared/care/species.ts); the tropical default targets
// (24–28 °C, pH 6.5–7.5) are `common practice` (shared/schemas/tank-defaults.ts). The 3-day
// watch, 28-day quarantine, acclimation schedule and the "cycled" rule (ammonia ≤ 0.02,
// nitrite ≤ 0.05 mg/L for 7 days with nitrate present) are `common practice`. Mixing
// estimates: volume-weighted temperature (heat balance) and averaged [H⁺] (pH = −log₁₀ a(H⁺),
// IUPAC Compendium of Chemical Terminology), worked by hand. Kit results are made up.
let t: CareTestApp
let org: TestOrg
let other: TestOrg
const DAY = 86_400_000

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Livestock Org')
  other = await t.createOrg('Other Livestock Org')
})
afterAll(() => t.close())

const add = (tankId: number, body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  t.api().post(`/api/v1/tanks/${tankId}/livestock`).set(as(org, role)).send(body)
const codes = (res: { body: { warnings: Array<{ code: string }> } }) => res.body.warnings.map((w) => w.code)

describe('adding livestock', () => {
  it('warns when the tank’s target band reaches outside the species range', async () => {
    const tankId = await newTank(t, org)
    const goldfish = await add(tankId, { speciesKey: 'goldfish', count: 2 })
    expect(goldfish.status, JSON.stringify(goldfish.body)).toBe(201)
    expect(codes(goldfish)).toEqual(['temperature_outside_range', 'ph_outside_range'])
    expect(goldfish.body.warnings[0].message).toBe("The tank's target 24–28 °C reaches outside the usual 10–24 °C for Goldfish")
    expect(codes(await add(tankId, { speciesKey: 'zebra_danio', count: 6 }))).toEqual([])
    expect(codes(await add(tankId, { speciesKey: 'ocellaris_clownfish', count: 1 }))).toContain('water_type')
  })

  it('warns about stocking a cycling tank, but not about plants', async () => {
    const tankId = await newTank(t, org, { stage: 'cycling' })
    expect(codes(await add(tankId, { speciesKey: 'bronze_corydoras', count: 4 }))).toEqual(['tank_cycling'])
    const fern = await add(tankId, { speciesKey: 'java_fern', count: 3 })
    expect(codes(fern)).toEqual([])
    expect(fern.body).toMatchObject({ acclimation: null, watchUntil: null, entry: { category: 'plant', name: 'Java fern' } })
  })

  it('returns an acclimation plan with mixing estimates and starts a 3-day watch', async () => {
    const tankId = await newTank(t, org)
    const before = Date.now()
    const res = await add(tankId, { speciesKey: 'bronze_corydoras', count: 5, source: 'Wholesaler', acclimation: { bagLitres: 1.2, bagTempC: 22, bagPh: 7.8 } })
    const plan = res.body.acclimation
    // Tank side: no readings, so the heater's 26 °C set point and the middle of the pH 6.5–7.5 target.
    expect(plan.tankTempC).toEqual({ value: 26, source: 'heater_set_point' })
    expect(plan.tankPh).toEqual({ value: 7, source: 'target' })
    expect(plan.steps.map((s: { minute: number }) => s.minute)).toEqual([0, 5, 10, 15, 20, 25])
    // Bag and tank water one to one at the end: (22 + 26) / 2 = 24 °C; pH −log₁₀((10^−7.8 + 10^−7) / 2) = 7.2371.
    expect(plan.steps.at(-1).estimatedTempC).toBeCloseTo(24, 9)
    expect(plan.steps.at(-1).estimatedPh).toBeCloseTo(7.2371, 4)
    expect(plan.note).toMatch(/rough guide/)
    const watch = new Date(res.body.watchUntil).getTime()
    expect(watch - before).toBeGreaterThanOrEqual(3 * DAY - 1000)
    expect(watch - before).toBeLessThan(3 * DAY + 60_000)
    const listed = await t.api().get(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'viewer'))
    expect(listed.body).toMatchObject({
      watchUntil: res.body.watchUntil,
      quarantine: null,
      entries: [{ name: 'Bronze corydoras', count: 5, source: 'Wholesaler' }],
    })
    const log = await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))
    expect(log.body).toMatchObject([{ kind: 'livestock_in', text: 'Added 5 × Bronze corydoras', values: { count: 5, speciesKey: 'bronze_corydoras' } }])
  })

  it('refuses unknown species, bad counts and viewers', async () => {
    const tankId = await newTank(t, org)
    expect(badFields(await add(tankId, { speciesKey: 'sea_monkey', count: 1 }))).toEqual(['speciesKey'])
    expect(badFields(await add(tankId, { speciesKey: 'guppy', count: 0 }))).toEqual(['count'])
    expect(badFields(await add(tankId, { count: 3 }))).toEqual(['speciesKey'])
    expect(badFields(await add(tankId, { name: 'Mystery tetra', count: 3, acclimation: { bagLitres: 0 } }))).toEqual(['acclimation.bagLitres'])
    expect(badFields(await add(tankId, { speciesKey: 'guppy', count: 1, addedAt: new Date(Date.now() + DAY).toISOString() }))).toEqual(['addedAt'])
    expect((await add(tankId, { speciesKey: 'guppy', count: 1 }, 'viewer')).status).toBe(403)
    expect((await t.api().post(`/api/v1/tanks/${tankId}/livestock`).set(as(other, 'owner')).send({ speciesKey: 'guppy', count: 1 })).status).toBe(404)
  })

  it('records losses and removal in the care log', async () => {
    const tankId = await newTank(t, org)
    const { body } = await add(tankId, { name: 'Mystery tetra', count: 8 })
    const patch = (changes: object) => t.api().patch(`/api/v1/tanks/${tankId}/livestock/${body.entry.id}`).set(as(org, 'keeper')).send(changes)
    expect((await patch({ losses: 2, count: 6 })).body).toMatchObject({ losses: 2, count: 6, removedAt: null })
    expect(badFields(await patch({ losses: 1 }))).toEqual(['losses'])
    expect((await patch({ removedAt: new Date().toISOString() })).body.removedAt).not.toBeNull()
    const log = await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))
    expect(log.body.map((e: { kind: string; text: string }) => [e.kind, e.text])).toEqual([
      ['livestock_out', 'Mystery tetra removed'],
      ['livestock_out', '2 × Mystery tetra lost'],
      ['livestock_in', 'Added 8 × Mystery tetra'],
    ])
  })

  it('counts quarantine days from the stage change, not from the first animals in', async () => {
    const tankId = await newTank(t, org, { stage: 'quarantine' })
    const empty = await t.api().get(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'viewer'))
    expect(empty.body.quarantine).toMatchObject({ daysIn: 0, daysRemaining: 28, days: 28 })
    await add(tankId, { speciesKey: 'angelfish', count: 2, addedAt: isoDaysAgo(10) })
    const res = await t.api().get(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'viewer'))
    expect(res.body.quarantine).toMatchObject({ daysIn: 0, daysRemaining: 28, days: 28 })
  })
})

describe('cycling from test-kit entries', () => {
  const kit = (tankId: number, daysAgo: number, values: Record<string, number>) =>
    t
      .api()
      .post(`/api/v1/tanks/${tankId}/test-kit-entries`)
      .set(as(org, 'keeper'))
      .send({
        takenAt: isoDaysAgo(daysAgo),
        values: Object.entries(values).map(([metric, value]) => ({ metric, value, unit: 'mg/L' })),
      })

  it('follows the peaks and calls the tank cycled after 7 days of zero ammonia and nitrite', async () => {
    const tankId = await newTank(t, org, { stage: 'cycling' })
    const cycling = async () => (await t.api().get(`/api/v1/tanks/${tankId}/cycling`).set(as(org, 'viewer'))).body
    expect((await cycling()).phase).toBe('no_data')
    for (const [daysAgo, values] of [
      [23, { ammonia: 2, nitrite: 0, nitrate: 0 }],
      [19, { ammonia: 4, nitrite: 0.25, nitrate: 0 }],
      [15, { ammonia: 1, nitrite: 2, nitrate: 5 }],
      [11, { ammonia: 0.25, nitrite: 5, nitrate: 10 }],
    ] as const)
      expect((await kit(tankId, daysAgo, values)).status).toBe(201)
    expect(await cycling()).toMatchObject({
      phase: 'nitrite',
      cycled: false,
      ammoniaPeak: { value: 4, passed: true },
      nitritePeak: { value: 5, passed: false },
      nitrateRising: true,
    })
    await kit(tankId, 7.5, { ammonia: 0, nitrite: 0, nitrate: 20 })
    expect(await cycling()).toMatchObject({ phase: 'nitrate', cycled: false, zeroDays: 0, daysToGo: 7, nitritePeak: { passed: true } })
    await kit(tankId, 0.1, { ammonia: 0.02, nitrite: 0.05, nitrate: 30 })
    const done = await cycling()
    expect(done).toMatchObject({ phase: 'cycled', cycled: true, daysToGo: 0, suggestion: 'The tank reads as cycled: set its stage to established' })
    expect(done.zeroDays).toBeCloseTo(7.4, 3)
    expect(done.rule).toMatch(/common practice/)
  })

  it('adds the new-plants note for plants added in the last 21 days', async () => {
    const tankId = await newTank(t, org, { kind: 'planted' })
    await add(tankId, { speciesKey: 'hornwort', count: 5, addedAt: isoDaysAgo(4) })
    const res = await t.api().get(`/api/v1/tanks/${tankId}/cycling`).set(as(org, 'viewer'))
    expect(res.body.newPlants).toMatchObject({ daysSince: 4 })
    expect((await t.api().get(`/api/v1/tanks/${tankId}/cycling`).set(as(other, 'owner'))).status).toBe(404)
  })
})

describe('care log', () => {
  it('takes hand entries from keepers and owners, filters by time, and refuses task_done and viewers', async () => {
    const tankId = await newTank(t, org)
    const post = (body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
      t.api().post(`/api/v1/tanks/${tankId}/care-log`).set(as(org, role)).send(body)
    expect((await post({ kind: 'dosing', at: isoDaysAgo(3), text: 'Fertiliser', values: { ml: 5 } })).status).toBe(201)
    expect((await post({ kind: 'equipment', text: 'New heater fitted' }, 'owner')).status).toBe(201)
    expect((await post({ kind: 'note', text: 'Looks fine' }, 'viewer')).status).toBe(403)
    expect(badFields(await post({ kind: 'task_done', text: 'x' }))).toEqual(['kind'])
    expect(badFields(await post({ kind: 'note' }))).toEqual(['text'])
    expect(badFields(await post({ kind: 'note', text: 'later', at: new Date(Date.now() + DAY).toISOString() }))).toEqual(['at'])
    const recent = await t
      .api()
      .get(`/api/v1/tanks/${tankId}/care-log?from=${encodeURIComponent(isoDaysAgo(1))}`)
      .set(as(org, 'viewer'))
    expect(recent.body.map((e: { kind: string }) => e.kind)).toEqual(['equipment'])
    const all = await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))
    expect(all.body.map((e: { kind: string; by: { id: number } }) => [e.kind, e.by.id])).toEqual([
      ['equipment', org.users.owner.id],
      ['dosing', org.users.keeper.id],
    ])
    expect(badFields(await t.api().get(`/api/v1/tanks/${tankId}/care-log?from=yesterday`).set(as(org, 'viewer')))).toEqual(['from'])
  })
})
