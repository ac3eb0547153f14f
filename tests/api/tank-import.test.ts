import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let shop = ''
let room = ''

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Sheet Org')
  shop = (await t.ctx.models.Site.findByPk(org.siteIds[0]))!.name
  room = (await t.ctx.models.Site.findByPk(org.siteIds[1]))!.name
})
afterAll(async () => {
  await t.close()
})

const post = (token: string, csv: string) => t.api().post('/api/v1/tanks/import').set(bearer(token)).send({ csv })

describe('tanks from a CSV sheet', () => {
  it('adds every row as a tank at its site, with its kind, volume, heater and the starter rules and care tasks', async () => {
    const csv = `name;site;kind;volume;set point\nSales row A1;${shop};Tropical freshwater;96;25\nQuarantine Q1;${room};coldwater;60;\n`
    const res = await post(org.users.keeper.token, csv)
    expect(res.status).toBe(201)
    expect(res.body.items.map((x: { name: string; siteId: number; kind: string; volumeLitres: number }) => [x.name, x.siteId, x.kind, x.volumeLitres])).toEqual(
      [
        ['Sales row A1', org.siteIds[0], 'tropical_freshwater', 96],
        ['Quarantine Q1', org.siteIds[1], 'coldwater', 60],
      ],
    )
    const [a1, q1] = res.body.items
    // common practice: about 1 W per litre for a 5 °C lift over a 20 °C room, rounded up to a size sold.
    expect(a1.heater).toEqual({ watts: 100, setPointC: 25, topCm: 0 })
    expect(q1.heater).toBeNull()
    expect(await t.ctx.models.WatchRule.count({ where: { tankId: a1.id } })).toBeGreaterThan(0)
    expect(await t.ctx.models.CareTask.count({ where: { tankId: a1.id } })).toBeGreaterThan(0)
  })

  it('adds nothing when a row is wrong, naming each row: an unknown site, a name the site has, a bad kind', async () => {
    const before = await t.ctx.models.Tank.count()
    const csv = `name,site,kind,volume\nNew one,${shop},marine,200\nSales row A1,${shop},marine,200\nElsewhere,Moon base,marine,50\nOdd,${shop},lagoon,50\n`
    const res = await post(org.users.owner.token, csv)
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({
      'row 5, kind': 'one of Tropical freshwater, Planted, Coldwater, Brackish, Marine',
    })
    const fixed = csv.replace('lagoon', 'marine')
    const again = await post(org.users.owner.token, fixed)
    expect(again.status).toBe(400)
    expect(again.body.error.fields).toEqual({
      'row 3, name': `${shop} already has a tank named "Sales row A1"`,
      'row 4, site': 'no site named "Moon base"; add it under Sites first',
    })
    expect(again.body.error.message).toBe('2 rows need fixing; nothing was added')
    expect(await t.ctx.models.Tank.count()).toBe(before)
  })

  it('refuses a file that is not CSV, an empty one, viewers, and another organisation’s sites', async () => {
    expect((await post(org.users.owner.token, 'name,site\n"unclosed,quote\n')).body.error.fields).toHaveProperty('csv')
    expect((await post(org.users.owner.token, '')).body.error.fields).toEqual({ csv: 'the file is empty' })
    expect((await post(org.users.viewer.token, `name,site,kind,volume\nX,${shop},marine,10\n`)).status).toBe(403)
    const other = await t.createOrg('Other Sheet Org')
    const res = await post(other.users.owner.token, `name,site,kind,volume\nX,${shop},marine,10\n`)
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ 'row 2, site': `no site named "${shop}"; add it under Sites first` })
  })
})
