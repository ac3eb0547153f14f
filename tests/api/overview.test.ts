import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { overviewService } from '../../server/overview/overview'
import type { Overview } from '@shared/schemas/overview'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { NIGHT, seedNight } from '../helpers/overview-night'

// Berlin is on CET, UTC+01:00, on 10 March 2026: summer time starts on the last Sunday of March
// (Directive 2000/84/EC, European Parliament and Council, 2001, Art. 2; EinhZeitG § 4). So 08:00
// there is 07:00 UTC, and the end of yesterday's working day, 18:00 on 9 March, is 17:00 UTC.
const NOW = new Date('2026-03-10T07:00:00Z')

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let overview: Overview
const actorOf = (o: TestOrg, role: 'owner' | 'keeper'): UserActor => ({
  kind: 'user',
  userId: o.users[role].id,
  organizationId: o.organizationId,
  role,
  siteIds: null,
  sessionId: 'test',
})

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Overview Org')
  await seedNight(t.ctx, org, NOW)
  overview = await overviewService(t.ctx).get(actorOf(org, 'owner'), NOW)
})
afterAll(async () => {
  await t.close()
})

const site = () => overview.sites.find((s) => s.site.id === org.siteIds[0])!

describe("the owner's overview after an injected night", () => {
  it("counts from 18:00 yesterday on the site's clock, and says the hour is assumed", () => {
    expect(site().since).toBe('2026-03-09T17:00:00.000Z')
    expect(site()).toMatchObject({ workdayEnd: '18:00', workdayEndAssumed: true })
  })

  it('lists the incidents opened since then and any still open, with who acknowledged and how fast', () => {
    const lines = site().overnight.incidents.map((i) => [i.title, i.tank.name, i.state, i.acknowledgedBy?.name ?? null, i.ackMinutes])
    expect(lines).toEqual([
      [NIGHT.titles.heater, NIGHT.tanks.reef1, 'resolved', 'keeper of Overview Org', NIGHT.ackMinutes.heater],
      [NIGHT.titles.quiet, NIGHT.tanks.reef1, 'acknowledged', 'owner of Overview Org', NIGHT.ackMinutes.quiet],
      [NIGHT.titles.ph, NIGHT.tanks.reef2, 'open', null, null],
    ])
  })

  it('names the tanks that were quiet overnight and the ones quiet now', () => {
    expect(site().overnight.quietTanks.map((q) => [q.tank.name, q.since, q.quietNow])).toEqual([
      [NIGHT.tanks.reef1, '2026-03-09T20:00:00.000Z', false],
      [NIGHT.tanks.reef3, null, true],
    ])
  })

  it('lists care that was due and not done, test-kit checks overdue, and water changes done', () => {
    expect(site().overnight.careMissed.map((c) => [c.title, c.tank.name, c.dueOn])).toEqual([[NIGHT.care.missed, NIGHT.tanks.reef1, '2026-03-08']])
    expect(site().overnight.kitOverdue.map((c) => [c.title, c.tank.name, c.dueOn])).toEqual([[NIGHT.care.kit, NIGHT.tanks.reef2, '2026-03-09']])
    expect(site().overnight.waterChanges.map((w) => [w.tank.name, w.at, w.by])).toEqual([
      [NIGHT.tanks.reef2, '2026-03-09T17:30:00.000Z', 'keeper of Overview Org'],
    ])
  })

  it('says who is on duty today, what care is due and which tanks are in quarantine with their day', () => {
    expect(site().today.onDuty.map((p) => p.name)).toEqual(['keeper of Overview Org'])
    expect(site().today.careDue.map((c) => [c.title, c.tank.name])).toEqual([[NIGHT.care.today, NIGHT.tanks.reef2]])
    expect(site().today.quarantine.map((q) => [q.tank.name, q.daysIn])).toEqual([[NIGHT.tanks.quarantine, NIGHT.quarantineDaysIn]])
  })

  it('counts the tank states per site as the wall does', () => {
    // The quarantine bay has neither a device nor a reading: nothing says it is steady.
    expect(site().states).toEqual({ steady: 0, watch: 1, alarm: 1, quiet: 1, no_sensor: 1 })
    const second = overview.sites.find((s) => s.site.id === org.siteIds[1])!
    expect(second.states).toEqual({ steady: 0, watch: 0, alarm: 0, quiet: 0, no_sensor: 0 })
    expect(second.overnight.incidents).toEqual([])
  })

  it('shows the owner the first-steps checklist and keepers none', async () => {
    expect(overview.checklist?.items.map((i) => `${i.step}:${i.done}`)).toEqual(['tanks:true', 'device:true', 'roster:true', 'people:true', 'wall:false'])
    expect((await overviewService(t.ctx).get(actorOf(org, 'keeper'), NOW)).checklist).toBeNull()
  })

  it("counts from the site's own end of the working day once the owner names one, refusing a time that is none", async () => {
    const path = `/api/v1/sites/${org.siteIds[0]}`
    const bad = await t.api().patch(path).set(bearer(org.users.owner.token)).send({ workdayEnd: '25:00' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('workdayEnd')
    const res = await t.api().patch(path).set(bearer(org.users.owner.token)).send({ workdayEnd: '20:00' })
    expect(res.status).toBe(200)
    expect(res.body.workdayEnd).toBe('20:00')
    const later = (await overviewService(t.ctx).get(actorOf(org, 'owner'), NOW)).sites.find((s) => s.site.id === org.siteIds[0])!
    // 20:00 CET on 9 March is 19:00 UTC: the water change at 17:30 UTC was before the evening began.
    expect(later).toMatchObject({ since: '2026-03-09T19:00:00.000Z', workdayEnd: '20:00', workdayEndAssumed: false })
    expect(later.overnight.waterChanges).toEqual([])
    await t.api().patch(path).set(bearer(org.users.owner.token)).send({ workdayEnd: null })
  })

  it('answers owners and keepers of the organisation only, over HTTP', async () => {
    const res = await t.api().get('/api/v1/overview').set(bearer(org.users.keeper.token))
    expect(res.status).toBe(200)
    expect(res.body.sites.map((s: { site: { id: number } }) => s.site.id).sort()).toEqual([...org.siteIds].sort())
    expect((await t.api().get('/api/v1/overview').set(bearer(org.users.viewer.token))).status).toBe(403)
    const other = await t.createOrg('Other Overview Org')
    const theirs = await t.api().get('/api/v1/overview').set(bearer(other.users.owner.token))
    expect(theirs.body.sites.map((s: { site: { id: number } }) => s.site.id).sort()).toEqual([...other.siteIds].sort())
  })
})
