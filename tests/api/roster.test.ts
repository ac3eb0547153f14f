import { LOCAL_DATE_FORMAT_MESSAGE } from '@shared/schemas/time'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { dutyRecipients } from '../../server/roster/roster'
import { bearer, startTestApp, type TestApp, type TestOrg } from '../helpers/app'

// Offsets used below, from the law rather than from the code under test:
// Directive 2000/84/EC (European Parliament and Council, 19 January 2001) Art. 2 and 3: summer
// time runs from 01:00 GMT on the last Sunday in March to 01:00 GMT on the last Sunday in
// October, in 2026 from 29 March to 25 October. Einheiten- und Zeitgesetz (EinhZeitG) § 4:
// Germany keeps CET = UTC+01:00, and CEST = UTC+02:00 in summer time.
// So every `+01:00` / `+02:00` written below is Berlin's offset at that instant.

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
let owner: Record<string, string>
let api: TestApp['api']
const MON = 0
const WED = 2
const SAT = 5
const SUN = 6

const path = (siteId: number, rest: string) => `/api/v1/sites/${siteId}/roster/${rest}`
const freshSite = async (timeZone = 'Europe/Berlin', of = org) =>
  (await t.ctx.models.Site.create({ organizationId: of.organizationId, name: `Roster site ${Math.random()}`, timeZone })).id
const addShift = (siteId: number, body: object, auth = owner) => api().post(path(siteId, 'shifts')).set(auth).send(body)
const addOverride = (siteId: number, body: object) => api().post(path(siteId, 'overrides')).set(owner).send(body)
const onDutyAt = async (siteId: number, at: string) => {
  const res = await api().get(path(siteId, 'on-duty')).query({ at }).set(owner)
  expect(res.status).toBe(200)
  return res.body
}
const onDutyIds = async (siteId: number, at: string) => (await onDutyAt(siteId, at)).onDuty.map((p: { userId: number }) => p.userId)
async function newUser(role: 'owner' | 'keeper' | 'viewer', of = org, active = true) {
  const n = Math.random().toString(36).slice(2, 8)
  return t.ctx.models.User.create({
    organizationId: of.organizationId,
    email: `${role}-${n}@roster.example`,
    name: `${role} ${n}`,
    role,
    passwordHash: 'x',
    active,
  })
}

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Roster Org')
  other = await t.createOrg('Other Roster Org')
  owner = bearer(org.users.owner.token)
  api = t.api
})
afterAll(() => t.close())

describe('weekly shifts', () => {
  it('creates, lists, changes only the fields sent, and deletes', async () => {
    const siteId = await freshSite()
    const created = await addShift(siteId, { userId: org.users.keeper.id, weekday: MON, start: '22:00', end: '06:00' })
    expect(created.status).toBe(201)
    expect(created.body).toEqual({
      id: expect.any(Number),
      siteId,
      userId: org.users.keeper.id,
      userName: 'keeper of Roster Org',
      weekday: MON,
      start: '22:00',
      end: '06:00',
    })
    const early = (await addShift(siteId, { userId: org.users.owner.id, weekday: MON, start: '06:00', end: '14:00' })).body
    const listed = await api().get(path(siteId, 'shifts')).set(owner)
    expect(listed.body.map((s: { id: number }) => s.id)).toEqual([early.id, created.body.id])
    const patched = await api()
      .patch(path(siteId, `shifts/${created.body.id}`))
      .set(owner)
      .send({ end: '07:00' })
    expect(patched.body).toEqual({ ...created.body, end: '07:00' })
    expect(
      (
        await api()
          .delete(path(siteId, `shifts/${created.body.id}`))
          .set(owner)
      ).status,
    ).toBe(204)
    expect((await api().get(path(siteId, 'shifts')).set(owner)).body.map((s: { id: number }) => s.id)).toEqual([early.id])
    const gone = await api()
      .patch(path(siteId, `shifts/${created.body.id}`))
      .set(owner)
      .send({ end: '08:00' })
    expect([gone.status, gone.body.error.code]).toEqual([404, 'not_found'])
    const elsewhere = await api()
      .delete(path(await freshSite(), `shifts/${early.id}`))
      .set(owner)
    expect(elsewhere.status).toBe(404)
  })

  it.each([
    ['24:00 is not a clock time', { start: '24:00' }, 'start', 'use HH:MM (24-hour)'],
    ['a weekday past Sunday', { weekday: 7 }, 'weekday', undefined],
    ['a user id that is text', { userId: 'keeper' }, 'userId', undefined],
  ])('refuses %s with the field named', async (_title, change, field, message) => {
    const body = { userId: org.users.keeper.id, weekday: MON, start: '09:00', end: '17:00', ...change }
    const res = await addShift(await freshSite(), body)
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual([field])
    if (message) expect(res.body.error.fields[field]).toBe(message)
  })

  it('assigns owners and keepers, but not viewers, inactive people or another organization’s users', async () => {
    const siteId = await freshSite()
    const shift = (userId: number) => addShift(siteId, { userId, weekday: MON, start: '09:00', end: '17:00' })
    expect((await shift(org.users.keeper.id)).status).toBe(201)
    expect((await shift(org.users.owner.id)).status).toBe(201)
    const cases: Array<[number, string]> = [
      [org.users.viewer.id, 'a viewer cannot be on duty'],
      [(await newUser('keeper', org, false)).id, 'this user is not active'],
      [other.users.keeper.id, 'unknown user'],
    ]
    for (const [userId, message] of cases) {
      const res = await shift(userId)
      expect([res.status, res.body.error.fields]).toEqual([400, { userId: message }])
    }
    const patch = await api()
      .patch(path(siteId, `shifts/${(await shift(org.users.keeper.id)).body.id}`))
      .set(owner)
      .send({ userId: org.users.viewer.id })
    expect([patch.status, patch.body.error.fields]).toEqual([400, { userId: 'a viewer cannot be on duty' }])
  })

  it('an end equal to the start is a full day, as shared/roster documents', async () => {
    const siteId = await freshSite()
    expect((await addShift(siteId, { userId: org.users.keeper.id, weekday: MON, start: '08:00', end: '08:00' })).status).toBe(201)
    expect(await onDutyIds(siteId, '2026-01-06T07:59:00+01:00')).toEqual([org.users.keeper.id])
    expect(await onDutyIds(siteId, '2026-01-06T08:00:00+01:00')).toEqual([])
  })
})

describe('roles and tenancy', () => {
  it('owners write; keepers and viewers read', async () => {
    const siteId = await freshSite()
    const body = { userId: org.users.keeper.id, weekday: MON, start: '09:00', end: '17:00' }
    const byKeeper = await addShift(siteId, body, bearer(org.users.keeper.token))
    expect([byKeeper.status, byKeeper.body.error.code]).toEqual([403, 'forbidden'])
    const backupByKeeper = await api().put(path(siteId, 'backup')).set(bearer(org.users.keeper.token)).send({ userId: null })
    expect(backupByKeeper.status).toBe(403)
    const shiftId = (await addShift(siteId, body)).body.id
    for (const role of ['keeper', 'viewer'] as const) {
      const auth = bearer(org.users[role].token)
      expect(
        (
          await api()
            .delete(path(siteId, `shifts/${shiftId}`))
            .set(auth)
        ).status,
      ).toBe(403)
      const read = await api().get(path(siteId, 'shifts')).set(auth)
      expect([read.status, read.body.map((s: { id: number }) => s.id)]).toEqual([200, [shiftId]])
      expect((await api().get(path(siteId, 'on-duty')).set(auth)).status).toBe(200)
      expect((await api().get(path(siteId, 'week')).query({ start: '2026-01-05' }).set(auth)).status).toBe(200)
    }
  })

  it('another organization’s site is not found, even for its owner', async () => {
    const siteId = await freshSite()
    const stranger = bearer(other.users.owner.token)
    for (const rest of ['shifts', 'overrides', 'on-duty', 'week?start=2026-01-05']) {
      const res = await api().get(path(siteId, rest)).set(stranger)
      expect([rest, res.status, res.body.error.code]).toEqual([rest, 404, 'not_found'])
    }
    const write = await addShift(siteId, { userId: other.users.keeper.id, weekday: MON, start: '09:00', end: '17:00' }, stranger)
    expect(write.status).toBe(404)
    expect((await api().put(path(siteId, 'backup')).set(stranger).send({ userId: null })).status).toBe(404)
  })
})

describe('on duty now', () => {
  it('follows a 22:00–06:00 shift across midnight (January: CET, +01:00)', async () => {
    const siteId = await freshSite()
    await addShift(siteId, { userId: org.users.keeper.id, weekday: MON, start: '22:00', end: '06:00' })
    const monday = await onDutyAt(siteId, '2026-01-05T23:30:00+01:00')
    expect(monday).toEqual({
      siteId,
      at: '2026-01-05T22:30:00.000Z',
      timeZone: 'Europe/Berlin',
      onDuty: [{ userId: org.users.keeper.id, name: 'keeper of Roster Org', email: org.users.keeper.email }],
      backup: { userId: org.users.owner.id, name: 'owner of Roster Org', email: org.users.owner.email },
      usingBackup: false,
    })
    expect(await onDutyIds(siteId, '2026-01-06T05:30:00+01:00')).toEqual([org.users.keeper.id])
    const after = await onDutyAt(siteId, '2026-01-06T06:00:00+01:00')
    expect([after.onDuty, after.usingBackup, after.backup.userId]).toEqual([[], true, org.users.owner.id])
  })

  it('keeps wall-clock shifts through the 29 March 2026 change to summer time (Directive 2000/84/EC Art. 2)', async () => {
    const siteId = await freshSite()
    await addShift(siteId, { userId: org.users.keeper.id, weekday: SAT, start: '22:00', end: '06:00' })
    expect(await onDutyIds(siteId, '2026-03-28T22:30:00+01:00')).toEqual([org.users.keeper.id])
    expect(await onDutyIds(siteId, '2026-03-29T05:30:00+02:00')).toEqual([org.users.keeper.id])
    // 06:30 CEST is 05:30 by a clock still on CET: a server ignoring the change would answer the keeper.
    expect(await onDutyIds(siteId, '2026-03-29T06:30:00+02:00')).toEqual([])
  })

  it('keeps wall-clock shifts through the 25 October 2026 change back to standard time (Art. 3)', async () => {
    const siteId = await freshSite()
    await addShift(siteId, { userId: org.users.keeper.id, weekday: SAT, start: '22:00', end: '06:00' })
    expect(await onDutyIds(siteId, '2026-10-24T22:30:00+02:00')).toEqual([org.users.keeper.id])
    // 05:30 CET is 06:30 by a clock still on CEST: a server ignoring the change would answer nobody.
    expect(await onDutyIds(siteId, '2026-10-25T05:30:00+01:00')).toEqual([org.users.keeper.id])
    expect(await onDutyIds(siteId, '2026-10-25T06:00:00+01:00')).toEqual([])
  })

  it('refuses an instant without an offset', async () => {
    const res = await api()
      .get(path(await freshSite(), 'on-duty'))
      .query({ at: '2026-01-05T10:00:00' })
      .set(owner)
    expect([res.status, Object.keys(res.body.error.fields)]).toEqual([400, ['at']])
  })
})

describe('overrides', () => {
  it('adds and removes people, lists by range, and deleting one restores the pattern', async () => {
    const siteId = await freshSite()
    const stand = await newUser('keeper')
    await addShift(siteId, { userId: org.users.keeper.id, weekday: MON, start: '09:00', end: '17:00' })
    const off = await addOverride(siteId, {
      userId: org.users.keeper.id,
      kind: 'remove',
      startsAt: '2026-01-05T12:00:00+01:00',
      endsAt: '2026-01-05T13:00:00+01:00',
      note: ' dentist ',
    })
    expect(off.status).toBe(201)
    expect(off.body).toEqual({
      id: expect.any(Number),
      siteId,
      userId: org.users.keeper.id,
      userName: 'keeper of Roster Org',
      kind: 'remove',
      startsAt: '2026-01-05T11:00:00.000Z',
      endsAt: '2026-01-05T12:00:00.000Z',
      note: 'dentist',
      createdBy: org.users.owner.id,
    })
    expect((await onDutyAt(siteId, '2026-01-05T12:30:00+01:00')).usingBackup).toBe(true)
    const cover = (await addOverride(siteId, { userId: stand.id, kind: 'add', startsAt: '2026-01-05T11:00:00Z', endsAt: '2026-01-05T12:00:00Z' })).body
    expect(await onDutyIds(siteId, '2026-01-05T12:30:00+01:00')).toEqual([stand.id])
    expect(await onDutyIds(siteId, '2026-01-05T13:00:00+01:00')).toEqual([org.users.keeper.id])
    const tuesday = (
      await addOverride(siteId, { userId: org.users.owner.id, kind: 'add', startsAt: '2026-01-06T10:00:00+01:00', endsAt: '2026-01-06T11:00:00+01:00' })
    ).body
    expect(await onDutyIds(siteId, '2026-01-06T10:30:00+01:00')).toEqual([org.users.owner.id])

    const list = (query: object) => api().get(path(siteId, 'overrides')).query(query).set(owner)
    const monday = await list({ from: '2026-01-05T00:00:00+01:00', to: '2026-01-06T00:00:00+01:00' })
    expect(monday.body.map((o: { id: number }) => o.id)).toEqual([off.body.id, cover.id])
    expect((await list({ from: '2026-01-06T00:00:00+01:00' })).body.map((o: { id: number }) => o.id)).toEqual([tuesday.id])
    expect((await list({})).body).toEqual([])

    expect(
      (
        await api()
          .delete(path(siteId, `overrides/${cover.id}`))
          .set(owner)
      ).status,
    ).toBe(204)
    expect((await onDutyAt(siteId, '2026-01-05T12:30:00+01:00')).onDuty).toEqual([])
    expect(
      (
        await api()
          .delete(path(siteId, `overrides/${cover.id}`))
          .set(owner)
      ).status,
    ).toBe(404)
  })

  it.each([
    ['an end before the start', { endsAt: '2026-01-05T08:00:00+01:00' }, 'endsAt'],
    ['an instant without an offset', { startsAt: '2026-01-05T09:00:00' }, 'startsAt'],
    ['an unknown kind', { kind: 'swap' }, 'kind'],
  ])('refuses %s with the field named', async (_title, change, field) => {
    const body = { userId: org.users.keeper.id, kind: 'add', startsAt: '2026-01-05T09:00:00+01:00', endsAt: '2026-01-05T10:00:00+01:00', ...change }
    const res = await addOverride(await freshSite(), body)
    expect([res.status, Object.keys(res.body.error.fields)]).toEqual([400, [field]])
  })

  it('refuses a viewer as the person added', async () => {
    const res = await addOverride(await freshSite(), {
      userId: org.users.viewer.id,
      kind: 'add',
      startsAt: '2026-01-05T09:00:00Z',
      endsAt: '2026-01-05T10:00:00Z',
    })
    expect([res.status, res.body.error.fields]).toEqual([400, { userId: 'a viewer cannot be on duty' }])
  })
})

describe('backup contact and recipients', () => {
  it('defaults to the first active owner by id, and follows the site’s chosen backup', async () => {
    const own = await t.createOrg('Backup Org')
    const ownerAuth = bearer(own.users.owner.token)
    const siteId = own.siteIds[0] as number
    const laterOwner = await newUser('owner', own)
    // Asked as the keeper: deactivating the first owner also ends that owner's sessions.
    const ask = async () => (await api().get(path(siteId, 'on-duty')).query({ at: '2026-01-05T10:00:00+01:00' }).set(bearer(own.users.keeper.token))).body
    expect((await ask()).backup.userId).toBe(own.users.owner.id)
    await t.ctx.models.User.update({ active: false }, { where: { id: own.users.owner.id } })
    expect((await ask()).backup.userId).toBe(laterOwner.id)
    await t.ctx.models.User.update({ active: true }, { where: { id: own.users.owner.id } })

    const set = await api().put(path(siteId, 'backup')).set(ownerAuth).send({ userId: own.users.keeper.id })
    expect(set.body).toEqual({
      siteId,
      backupUserId: own.users.keeper.id,
      backup: { userId: own.users.keeper.id, name: 'keeper of Backup Org', email: own.users.keeper.email },
    })
    expect(await ask()).toMatchObject({ onDuty: [], usingBackup: true, backup: { userId: own.users.keeper.id } })
    expect(await dutyRecipients(t.ctx, siteId, new Date('2026-01-05T09:00:00Z'))).toEqual([set.body.backup])

    const viewer = await api().put(path(siteId, 'backup')).set(ownerAuth).send({ userId: own.users.viewer.id })
    expect([viewer.status, viewer.body.error.fields]).toEqual([400, { userId: 'a viewer cannot be on duty' }])
    const cleared = await api().put(path(siteId, 'backup')).set(ownerAuth).send({ userId: null })
    expect([cleared.body.backupUserId, cleared.body.backup.userId]).toEqual([null, own.users.owner.id])
    expect((await ask()).backup.userId).toBe(own.users.owner.id)
  })

  it('dutyRecipients names whoever is on duty, in two queries, and drops people deactivated since', async () => {
    const siteId = await freshSite()
    const late = await newUser('keeper')
    await addShift(siteId, { userId: org.users.keeper.id, weekday: MON, start: '09:00', end: '17:00' })
    await addShift(siteId, { userId: late.id, weekday: MON, start: '12:00', end: '20:00' })
    const at = new Date('2026-01-05T12:30:00+01:00')
    let queries = 0
    t.ctx.sequelize.addHook('afterQuery', 'count-roster', () => void queries++)
    const both = await dutyRecipients(t.ctx, siteId, at)
    t.ctx.sequelize.removeHook('afterQuery', 'count-roster')
    expect(queries).toBe(2)
    expect(both).toEqual([
      { userId: org.users.keeper.id, name: 'keeper of Roster Org', email: org.users.keeper.email },
      { userId: late.id, name: late.name, email: late.email },
    ])
    await late.update({ active: false })
    expect((await dutyRecipients(t.ctx, siteId, at)).map((p) => p.userId)).toEqual([org.users.keeper.id])
  })
})

describe('week view', () => {
  it('shows pattern and override stretches in real instants, not clipped to the week', async () => {
    const siteId = await freshSite()
    const second = await newUser('keeper')
    const { keeper, owner: boss } = org.users
    await addShift(siteId, { userId: keeper.id, weekday: MON, start: '09:00', end: '17:00' })
    await addShift(siteId, { userId: boss.id, weekday: SUN, start: '22:00', end: '06:00' })
    await addShift(siteId, { userId: second.id, weekday: WED, start: '10:00', end: '14:00' })
    await addOverride(siteId, { userId: keeper.id, kind: 'add', startsAt: '2026-01-05T16:00:00+01:00', endsAt: '2026-01-05T19:00:00+01:00' })
    await addOverride(siteId, { userId: second.id, kind: 'remove', startsAt: '2026-01-07T11:00:00+01:00', endsAt: '2026-01-07T12:00:00+01:00' })
    const res = await api().get(path(siteId, 'week')).query({ start: '2026-01-05' }).set(owner)
    const span = (who: { id: number }, name: string, startsAt: string, endsAt: string, source = 'pattern') => ({
      userId: who.id,
      name,
      startsAt,
      endsAt,
      source,
    })
    expect(res.body).toEqual({
      weekStart: '2026-01-05',
      timeZone: 'Europe/Berlin',
      spans: [
        span(boss, 'owner of Roster Org', '2026-01-04T21:00:00.000Z', '2026-01-05T05:00:00.000Z'),
        span(keeper, 'keeper of Roster Org', '2026-01-05T08:00:00.000Z', '2026-01-05T16:00:00.000Z'),
        span(keeper, 'keeper of Roster Org', '2026-01-05T16:00:00.000Z', '2026-01-05T18:00:00.000Z', 'override'),
        span(second, second.name, '2026-01-07T09:00:00.000Z', '2026-01-07T10:00:00.000Z'),
        span(second, second.name, '2026-01-07T11:00:00.000Z', '2026-01-07T13:00:00.000Z'),
        span(boss, 'owner of Roster Org', '2026-01-11T21:00:00.000Z', '2026-01-12T05:00:00.000Z'),
      ],
    })
  })

  it('a night shift lasts 7 h on 29 March 2026 and 9 h on 25 October 2026 (Directive 2000/84/EC)', async () => {
    const siteId = await freshSite()
    await addShift(siteId, { userId: org.users.keeper.id, weekday: SAT, start: '22:00', end: '06:00' })
    const spansOf = async (start: string) => (await api().get(path(siteId, 'week')).query({ start }).set(owner)).body.spans
    // 22:00 CET = 21:00 UTC, 06:00 CEST = 04:00 UTC; in October 22:00 CEST = 20:00 UTC, 06:00 CET = 05:00 UTC.
    expect((await spansOf('2026-03-23'))[0]).toMatchObject({ startsAt: '2026-03-28T21:00:00.000Z', endsAt: '2026-03-29T04:00:00.000Z' })
    expect((await spansOf('2026-10-19'))[0]).toMatchObject({ startsAt: '2026-10-24T20:00:00.000Z', endsAt: '2026-10-25T05:00:00.000Z' })
  })

  it('refuses a start that is not a calendar date', async () => {
    const res = await api()
      .get(path(await freshSite(), 'week'))
      .query({ start: '2026-02-30' })
      .set(owner)
    expect([res.status, res.body.error.fields]).toEqual([400, { start: LOCAL_DATE_FORMAT_MESSAGE }])
  })
})
