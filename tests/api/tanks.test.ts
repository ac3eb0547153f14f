import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEFAULT_TARGETS } from '@shared/schemas/tank-defaults'
import { TANK_KINDS } from '@shared/schemas/tanks'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

// Volume checks: 1 L = 1 dm³ = 10³ cm³ (BIPM, The International System of Units (SI Brochure), 8th ed.,
// 2006, updated 2014, Table 6). Box V = l·w·h, cylinder V = π·r²·h, semicircle area π·r²/2 (elementary
// geometry). Circular segment of chord c and height s: R = (c²/4 + s²)/(2s), θ = 2·asin(c/2R),
// area ½·R²·(θ − sin θ) (E. W. Weisstein, CRC Concise Encyclopedia of Mathematics, 1999, "Circular
// Segment"; same formula in Wikipedia, "Circular segment", 2016). The API stores litres to 0.1 L.

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let stranger: TestOrg
let keeper: Record<string, string>

const create = (body: object, auth = keeper) => t.api().post('/api/v1/tanks').set(auth).send(body)
const patch = (id: number, body: object) => t.api().patch(`/api/v1/tanks/${id}`).set(keeper).send(body)
const list = (query: string, auth = keeper) => t.api().get(`/api/v1/tanks?${query}`).set(auth)
const names = (res: { body: { items: Array<{ name: string }> } }) => res.body.items.map((i) => i.name)

async function created(body: object) {
  const res = await create(body)
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body
}

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Tank Org')
  stranger = await t.createOrg('Stranger')
  keeper = bearer(org.users.keeper.token)
})
afterAll(() => t.close())

describe('create: the volume', () => {
  it('rectangular 100 × 40 × 50 cm holds 200 L', async () => {
    const tank = await created(sampleTank(org.siteIds[0]))
    expect([tank.volumeLitres, tank.volumeSource]).toEqual([200, 'dimensions'])
    expect(tank.dimensions).toEqual({ shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 })
    expect(tank.siteName).toBe('Tank Org shop')
    expect([tank.substrateDepthCm, tank.filter, tank.notes, tank.sortOrder, tank.archivedAt]).toEqual([0, '', '', 0, null])
  })

  it('cylinder Ø 40 × 50 cm: π × 20² × 50 = 62 831.9 cm³ → 62.8 L', async () => {
    const tank = await created(sampleTank(org.siteIds[0], { dimensions: { shape: 'cylinder', diameterCm: 40, heightCm: 50 } }))
    expect(tank.volumeLitres).toBe(62.8)
  })

  it('bow front whose bow is half the length is a box plus a semicircle: (60·30 + π·30²/2) · 50 → 160.7 L', async () => {
    const dimensions = { shape: 'bow_front', lengthCm: 60, widthCm: 30, bowCm: 30, heightCm: 50 }
    expect((await created(sampleTank(org.siteIds[0], { dimensions }))).volumeLitres).toBe(160.7)
  })

  it('bow front 100 × 40, bow 10, height 50: segment R = 130 cm, area 671.97 cm² → 233.6 L', async () => {
    const dimensions = { shape: 'bow_front', lengthCm: 100, widthCm: 40, bowCm: 10, heightCm: 50 }
    expect((await created(sampleTank(org.siteIds[0], { dimensions }))).volumeLitres).toBe(233.6)
  })

  it('keeps the entered volume when no dimensions are given, and prefers dimensions when both are', async () => {
    const entered = await created(sampleTank(org.siteIds[0], { dimensions: null, heater: null, volumeLitres: 120 }))
    expect([entered.volumeLitres, entered.volumeSource, entered.dimensions]).toEqual([120, 'entered', null])
    const both = await created(sampleTank(org.siteIds[0], { volumeLitres: 999 }))
    expect([both.volumeLitres, both.volumeSource]).toEqual([200, 'dimensions'])
  })
})

describe('create: targets', () => {
  it.each(TANK_KINDS)('%s gets the kind’s default targets when none are given', async (kind) => {
    const tank = await created(sampleTank(org.siteIds[0], { kind }))
    expect(tank.targets).toEqual(DEFAULT_TARGETS[kind])
  })

  it('marine defaults are pH 8.0–8.4 and 24–27 °C (common practice)', async () => {
    const tank = await created(sampleTank(org.siteIds[0], { kind: 'marine' }))
    expect(tank.targets.ph).toEqual({ min: 8.0, max: 8.4 })
    expect(tank.targets.temperature).toEqual({ min: 24, max: 27 })
  })

  it('keeps given targets as they are', async () => {
    const targets = { temperature: { min: 25, max: 26 } }
    expect((await created(sampleTank(org.siteIds[0], { targets }))).targets).toEqual(targets)
  })
})

describe('create: validation names the field', () => {
  const rect = (over: object) => ({ shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50, ...over })
  it.each([
    ['a negative length', { dimensions: rect({ lengthCm: -10 }) }, 'dimensions.lengthCm', 'must be above zero'],
    ['neither dimensions nor volume', { dimensions: null }, 'volumeLitres', 'give the dimensions or the volume'],
    ['the heater top above the tank', { heater: { watts: 200, setPointC: 26, topCm: 60 } }, 'heater.topCm', 'the heater top cannot be above the tank'],
    ['a light time of 25:00', { lightSchedule: { on: '25:00', off: '20:00' } }, 'lightSchedule.on', 'use HH:MM (24-hour)'],
    ['an unknown site', { siteId: 999_999 }, 'siteId', 'no such site'],
    ['an empty name', { name: '   ' }, 'name', 'required'],
    [
      'a bow deeper than half the length',
      { dimensions: { shape: 'bow_front', lengthCm: 60, widthCm: 30, bowCm: 40, heightCm: 50 } },
      'dimensions.bowCm',
      'bowCm must not exceed half of lengthCm (got 40 for length 60)',
    ],
    ['a tank too small to hold 0.05 L', { dimensions: rect({ lengthCm: 1, widthCm: 1, heightCm: 1 }), heater: null }, 'dimensions', 'holds less than 0.05 L'],
  ])('%s', async (_name, over, field, message) => {
    const res = await create(sampleTank(org.siteIds[0], over))
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(res.body.error.fields[field]).toBe(message)
    expect(res.body.error.message).toBe(`${field}: ${message}`)
  })

  it('refuses another organization’s site and an archived site', async () => {
    const foreign = await create(sampleTank(stranger.siteIds[0]))
    expect([foreign.status, foreign.body.error.fields]).toEqual([400, { siteId: 'no such site' }])
    const site = await t.ctx.models.Site.create({ organizationId: org.organizationId, name: 'Closed', timeZone: 'UTC', archivedAt: new Date() })
    const archived = await create(sampleTank(site.id))
    expect([archived.status, archived.body.error.fields]).toEqual([400, { siteId: 'the site is archived' }])
  })

  it('answers 400 or 404, never 500, for malformed requests', async () => {
    const cases: Array<[() => PromiseLike<{ status: number }>, number]> = [
      [() => t.api().post('/api/v1/tanks').set(keeper).send([1, 2]), 400],
      [() => t.api().post('/api/v1/tanks').set(keeper).set('Content-Type', 'text/plain').send('name=x'), 400],
      [() => create(sampleTank(org.siteIds[0], { siteId: 'one', kind: 'shark' })), 400],
      [() => create(sampleTank(org.siteIds[0], { dimensions: { shape: 'hexagon', sideCm: 30 } })), 400],
      [() => list('sortBy=colour'), 400],
      [() => list('pageSize=500'), 400],
      [() => list('siteId=1&siteId=2'), 400],
      [() => t.api().get('/api/v1/tanks/abc').set(keeper), 400],
      [() => t.api().get('/api/v1/tanks/99999999999').set(keeper), 400],
      [() => patch(99_999_999, { name: 'Ghost' }), 404],
    ]
    for (const [send, status] of cases) expect((await send()).status).toBe(status)
  })
})

describe('list: paging, sorting, search and filters', () => {
  let pagingOrg: TestOrg
  let auth: Record<string, string>
  beforeAll(async () => {
    pagingOrg = await t.createOrg('Paging')
    auth = bearer(pagingOrg.users.keeper.token)
    const [shop, fishRoom] = pagingOrg.siteIds
    const entered = (name: string, siteId: number, volumeLitres: number, over: object = {}) =>
      sampleTank(siteId, { name, dimensions: null, heater: null, volumeLitres, ...over })
    for (const body of [
      sampleTank(shop, { name: 'Angelfish' }),
      entered('Clownfish', shop, 80, { stage: 'quarantine' }),
      entered('Eel', shop, 500, { stage: 'cycling', kind: 'marine' }),
      entered('Barb', fishRoom, 60, { notes: 'Needs a FISH-proof lid' }),
      entered('Discus', fishRoom, 300, { stage: 'quarantine' }),
    ]) {
      expect((await create(body, auth)).status).toBe(201)
    }
  })

  it.each([
    ['sortBy=name', ['Angelfish', 'Barb', 'Clownfish', 'Discus', 'Eel']],
    ['sortBy=name&sortDesc=true', ['Eel', 'Discus', 'Clownfish', 'Barb', 'Angelfish']],
    ['sortBy=volume', ['Barb', 'Clownfish', 'Angelfish', 'Discus', 'Eel']],
    ['sortBy=volume&sortDesc=true', ['Eel', 'Discus', 'Angelfish', 'Clownfish', 'Barb']],
    // "Paging fish room" sorts before "Paging shop"; within a site, by name.
    ['sortBy=site', ['Barb', 'Discus', 'Angelfish', 'Clownfish', 'Eel']],
    ['sortBy=site&sortDesc=true', ['Angelfish', 'Clownfish', 'Eel', 'Barb', 'Discus']],
    ['search=fish', ['Angelfish', 'Barb', 'Clownfish']],
    ['search=%25', []],
    ['stage=quarantine', ['Clownfish', 'Discus']],
    ['kind=marine', ['Eel']],
  ])('%s', async (query, expected) => {
    const res = await list(query, auth)
    expect(res.status).toBe(200)
    expect(names(res)).toEqual(expected)
    expect(res.body.total).toBe(expected.length)
  })

  it('filters by site, alone and with a stage', async () => {
    const [shop, fishRoom] = pagingOrg.siteIds
    expect(names(await list(`siteId=${fishRoom}`, auth))).toEqual(['Barb', 'Discus'])
    expect(names(await list(`siteId=${shop}&stage=quarantine`, auth))).toEqual(['Clownfish'])
  })

  it('pages keep the total and the order', async () => {
    const page2 = await list('pageSize=2&page=2', auth)
    expect(page2.body).toMatchObject({ total: 5, page: 2, pageSize: 2 })
    expect(names(page2)).toEqual(['Clownfish', 'Discus'])
    expect(names(await list('pageSize=2&page=3', auth))).toEqual(['Eel'])
    const beyond = await list('pageSize=2&page=4', auth)
    expect([beyond.body.items, beyond.body.total]).toEqual([[], 5])
  })
})

describe('update', () => {
  it('changes only the fields sent', async () => {
    const tank = await created(sampleTank(org.siteIds[0], { filter: 'Canister 1200', notes: 'Front row' }))
    const res = await patch(tank.id, { name: 'Renamed' })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const { name, updatedAt, ...rest } = res.body
    const { name: _oldName, updatedAt: _oldUpdated, ...before } = tank
    expect(name).toBe('Renamed')
    expect(rest).toEqual(before)
  })

  it('recomputes the volume from new dimensions, or keeps an entered one', async () => {
    const tank = await created(sampleTank(org.siteIds[0]))
    const longer = await patch(tank.id, { dimensions: { shape: 'rectangular', lengthCm: 120, widthCm: 40, heightCm: 50 } })
    expect([longer.body.volumeLitres, longer.body.volumeSource]).toEqual([240, 'dimensions'])
    const entered = await patch(tank.id, { dimensions: null, volumeLitres: 150 })
    expect([entered.body.volumeLitres, entered.body.volumeSource, entered.body.dimensions]).toEqual([150, 'entered', null])
  })

  it('checks the merged tank: a lower tank cannot leave the heater sticking out', async () => {
    const tank = await created(sampleTank(org.siteIds[0]))
    const res = await patch(tank.id, { dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 20 } })
    expect([res.status, res.body.error.fields]).toEqual([400, { 'heater.topCm': 'the heater top cannot be above the tank' }])
    const band = await patch(tank.id, { targets: { ph: { min: 7.5, max: 6.5 } } })
    expect([band.status, band.body.error.fields]).toEqual([400, { 'targets.ph.max': 'min must not exceed max' }])
    expect((await t.api().get(`/api/v1/tanks/${tank.id}`).set(keeper)).body.dimensions.heightCm).toBe(50)
  })

  it('moves to another site of the organization, not to an archived or foreign one', async () => {
    const tank = await created(sampleTank(org.siteIds[0]))
    const moved = await patch(tank.id, { siteId: org.siteIds[1] })
    expect([moved.body.siteId, moved.body.siteName]).toEqual([org.siteIds[1], 'Tank Org fish room'])
    expect((await patch(tank.id, { siteId: stranger.siteIds[1] })).body.error.fields).toEqual({ siteId: 'no such site' })
  })
})

describe('archive', () => {
  it('owner only; archived tanks are hidden unless includeArchived=true, and come back on unarchive', async () => {
    const archiveOrg = await t.createOrg('Archive')
    const ownerAuth = bearer(archiveOrg.users.owner.token)
    const tank = (await create(sampleTank(archiveOrg.siteIds[0], { name: 'Retiring' }), ownerAuth)).body
    const byKeeper = await t.api().post(`/api/v1/tanks/${tank.id}/archive`).set(bearer(archiveOrg.users.keeper.token))
    expect([byKeeper.status, byKeeper.body.error.code]).toEqual([403, 'forbidden'])
    const archived = await t.api().post(`/api/v1/tanks/${tank.id}/archive`).set(ownerAuth)
    expect(archived.status).toBe(200)
    expect(Date.parse(archived.body.archivedAt)).toBeGreaterThan(Date.now() - 60_000)
    expect((await list('', ownerAuth)).body.total).toBe(0)
    expect(names(await list('includeArchived=true', ownerAuth))).toEqual(['Retiring'])
    expect((await t.api().get(`/api/v1/tanks/${tank.id}`).set(ownerAuth)).body.archivedAt).toBe(archived.body.archivedAt)
    const sites = await t.api().get('/api/v1/sites').set(ownerAuth)
    expect(sites.body.find((s: { id: number }) => s.id === archiveOrg.siteIds[0]).tankCount).toBe(0)
    const back = await t.api().post(`/api/v1/tanks/${tank.id}/unarchive`).set(ownerAuth)
    expect([back.status, back.body.archivedAt]).toEqual([200, null])
    expect(names(await list('', ownerAuth))).toEqual(['Retiring'])
  })
})
