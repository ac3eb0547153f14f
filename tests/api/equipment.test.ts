import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import { createMailNotifier } from '../../server/incidents/mail-notifier'
import type { TestOrg } from '../helpers/app'
import { as, badFields, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Service intervals (lamp tubes yearly, impellers every 3 months, heaters monthly) are `common
// practice` (shared/equipment/defaults.ts). Ages are calendar arithmetic, worked by hand.
let t: CareTestApp
let org: TestOrg
let other: TestOrg
let siteId: number
let zone: string

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Equipment Org')
  other = await t.createOrg('Other Equipment Org')
  siteId = org.siteIds[0] as number
  zone = (await t.ctx.models.Site.findByPk(siteId))!.timeZone
})
afterAll(() => t.close())

const api = () => t.api()
/** The site's calendar date `years` and `months` back, on a day every month has. */
function monthsAgo(years: number, months: number): string {
  const today = localDateAt(zone, Date.now())
  const total = today.year * 12 + (today.month - 1) - years * 12 - months
  return formatLocalDate({ year: Math.floor(total / 12), month: (total % 12) + 1, day: Math.min(today.day, 28) })
}
const today = () => formatLocalDate(localDateAt(zone, Date.now()))
const addEquipment = async (tankId: number, body: object) => {
  const res = await api().post(`/api/v1/tanks/${tankId}/equipment`).set(as(org, 'keeper')).send(body)
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body
}
const careToday = async () => (await api().get(`/api/v1/care/today?siteId=${siteId}`).set(as(org, 'keeper'))).body

describe('equipment on a tank', () => {
  it('turns a lamp due for replacement into a care task, and a replacement into a care-log entry', async () => {
    const tankId = await newTank(t, org, { name: 'Lamp tank' })
    const lamp = await addEquipment(tankId, { kind: 'lamp', name: 'Display lamp', model: 'T5 39 W tube', watts: 39, installedOn: monthsAgo(1, 1) })
    expect(lamp).toMatchObject({ serviceAction: 'replace', serviceEveryDays: 365, age: '1 year 1 month', due: { status: 'overdue' } })
    const pump = await addEquipment(tankId, { kind: 'pump', name: 'Return pump', installedOn: today() })
    expect(pump).toMatchObject({ serviceAction: 'service', serviceEveryDays: 91, due: { status: 'later', daysUntilDue: 91 } })

    // The tank's starter routine is due on its first day too; the equipment's task is the one to find.
    type Due = { tank: { id: number }; kind: string; title: string }
    const equipmentDue = async () => ((await careToday()).tasks as Due[]).filter((task) => task.tank.id === tankId && task.kind === 'equipment_service')
    const due = await equipmentDue()
    expect(due.map((task: { kind: string; title: string }) => [task.kind, task.title])).toEqual([['equipment_service', 'Replace the lamp tube: Display lamp']])

    const replaced = await api()
      .post(`/api/v1/equipment/${lamp.id}/replace`)
      .set(as(org, 'keeper'))
      .send({ model: 'T5 39 W tube, new', notes: 'old one flickering' })
    expect(replaced.status, JSON.stringify(replaced.body)).toBe(200)
    expect(replaced.body).toMatchObject({ installedOn: today(), age: 'today', due: { status: 'later', daysUntilDue: 365 } })
    expect(await equipmentDue()).toEqual([])
    const log = await api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))
    expect(log.body.map((e: { kind: string; text: string }) => [e.kind, e.text])).toEqual([
      ['equipment', 'Lamp replaced: Display lamp (T5 39 W tube → T5 39 W tube, new): old one flickering'],
    ])

    // A shorter interval moves the reminder; retiring the lamp switches it off.
    expect((await api().patch(`/api/v1/equipment/${lamp.id}`).set(as(org, 'keeper')).send({ serviceEveryDays: 180 })).body.due.daysUntilDue).toBe(180)
    expect((await api().patch(`/api/v1/equipment/${lamp.id}`).set(as(org, 'keeper')).send({ retired: true })).body).toMatchObject({ due: null })
  })

  it("shows the heater's age on a temperature incident and in its mail", async () => {
    const tankId = await newTank(t, org, { name: 'Warm tank' })
    await addEquipment(tankId, { kind: 'heater', name: 'Main heater', watts: 200, installedOn: monthsAgo(2, 3) })
    const at = new Date()
    const incident = await t.ctx.models.Incident.create({
      organizationId: org.organizationId,
      siteId,
      tankId,
      ruleId: null,
      ruleKind: 'above',
      metric: 'temperature',
      severity: 'alarm',
      title: 'Temperature above 29 °C',
      state: 'open',
      conditionSince: at,
      openedAt: at,
      firstValue: 29.5,
      peakValue: 29.5,
      latestValue: 29.5,
      latestAt: at,
    })
    const page = await api().get(`/api/v1/incidents/${incident.id}`).set(as(org, 'viewer'))
    expect(page.body.heater).toMatchObject({ name: 'Main heater', text: 'Heater installed 2 years 3 months ago' })

    await t.ctx.sequelize.transaction((transaction) => createMailNotifier(t.ctx).notify('opened', incident, transaction))
    const mails = await t.ctx.sequelize.query<{ text: string }>('SELECT text_body AS text FROM mail_outbox WHERE incident_id = $1', {
      bind: [incident.id],
      type: QueryTypes.SELECT,
    })
    expect(mails.length).toBeGreaterThan(0)
    expect(mails[0]!.text).toContain('Equipment: Heater installed 2 years 3 months ago')
  })

  it('gives each copy of a tank its own working equipment with its own service reminder, and leaves retired parts behind', async () => {
    const tankId = await newTank(t, org, { name: 'Copied tank' })
    const pump = await addEquipment(tankId, { kind: 'pump', name: 'Return pump', model: 'RP-12', installedOn: today(), serviceEveryDays: 90 })
    const old = await addEquipment(tankId, { kind: 'lamp', name: 'Old lamp', installedOn: today() })
    expect((await api().patch(`/api/v1/equipment/${old.id}`).set(as(org, 'keeper')).send({ retired: true })).status).toBe(200)
    const copy = await api().post(`/api/v1/tanks/${tankId}/duplicate`).set(as(org, 'owner')).send({ count: 2 })
    expect(copy.status, JSON.stringify(copy.body)).toBe(201)
    const copyIds: number[] = copy.body.items.map((x: { id: number }) => x.id)
    for (const id of copyIds) {
      const kit = await api().get(`/api/v1/tanks/${id}/equipment`).set(as(org, 'viewer'))
      expect(kit.body.map((e: { name: string; model: string; installedOn: string }) => [e.name, e.model, e.installedOn])).toEqual([
        ['Return pump', 'RP-12', today()],
      ])
      expect(kit.body[0].id).not.toBe(pump.id)
      const tasks = await api().get(`/api/v1/tanks/${id}/care-tasks`).set(as(org, 'viewer'))
      expect(tasks.body.filter((task: { kind: string }) => task.kind === 'equipment_service').map((task: { title: string }) => task.title)).toEqual([
        'Clean the pump impeller: Return pump',
      ])
    }
    const source = await api().get(`/api/v1/tanks/${tankId}/equipment`).set(as(org, 'viewer'))
    expect(source.body).toHaveLength(2)
  })

  it('refuses bad equipment, viewers and strangers', async () => {
    const tankId = await newTank(t, org)
    const post = (body: object, role: 'keeper' | 'viewer' = 'keeper') => api().post(`/api/v1/tanks/${tankId}/equipment`).set(as(org, role)).send(body)
    expect(badFields(await post({ kind: 'toaster', name: 'x', installedOn: today() }))).toEqual(['kind'])
    expect(badFields(await post({ kind: 'lamp', name: 'x', installedOn: '2099-01-01' }))).toEqual(['installedOn'])
    expect(badFields(await post({ kind: 'lamp', name: 'x', installedOn: today(), serviceEveryDays: 0 }))).toEqual(['serviceEveryDays'])
    expect((await post({ kind: 'lamp', name: 'x', installedOn: today() }, 'viewer')).status).toBe(403)
    expect((await api().get(`/api/v1/tanks/${tankId}/equipment`).set(as(other, 'owner'))).status).toBe(404)
  })
})

describe('consumables', () => {
  it('draws stock down as care tasks are done, and shows low stock and expired reagents in Care today', async () => {
    const tankId = await newTank(t, org, { name: 'Salt tank' })
    const add = async (body: object) => {
      const res = await api().post(`/api/v1/sites/${siteId}/consumables`).set(as(org, 'keeper')).send(body)
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      return res.body
    }
    const salt = await add({ kind: 'salt', name: 'Reef salt', unit: 'kg', quantity: 5, lowAt: 2 })
    const yesterday = formatLocalDate(localDateAt(zone, Date.now() - 86_400_000))
    const reagent = await add({ kind: 'reagent', name: 'Nitrite reagent 2', unit: 'ml', quantity: 30, expiresOn: yesterday })
    await add({ kind: 'carbon', name: 'Carbon', unit: 'l', quantity: 3, lowAt: 1, expiresOn: today() })
    expect(reagent).toMatchObject({ expired: true, low: false })

    const task = await api()
      .post(`/api/v1/tanks/${tankId}/care-tasks`)
      .set(as(org, 'owner'))
      .send({ kind: 'water_change', title: 'Mix salt water', recurrence: { kind: 'interval', everyDays: 7 }, consumableId: salt.id, consumableAmount: 1.5 })
    expect(task.status, JSON.stringify(task.body)).toBe(201)
    for (let i = 0; i < 2; i++) expect((await api().post(`/api/v1/care-tasks/${task.body.id}/done`).set(as(org, 'keeper')).send({})).status).toBe(200)
    // 5 kg − 2 × 1.5 kg = 2 kg: at the low mark.
    const list = (await api().get(`/api/v1/sites/${siteId}/consumables`).set(as(org, 'viewer'))).body
    expect(list.find((c: { id: number }) => c.id === salt.id)).toMatchObject({ quantity: 2, low: true })

    const stock = (await careToday()).stock
    expect(stock.map((c: { name: string; low: boolean; expired: boolean }) => [c.name, c.low, c.expired])).toEqual([
      ['Nitrite reagent 2', false, true],
      ['Reef salt', true, false],
    ])
    // Restocked: no longer low.
    expect((await api().patch(`/api/v1/consumables/${salt.id}`).set(as(org, 'keeper')).send({ quantity: 25 })).body.low).toBe(false)
  })

  it('refuses a consumable of another site, bad stock and strangers', async () => {
    const tankId = await newTank(t, org)
    const elsewhere = await t.ctx.models.Site.create({ organizationId: org.organizationId, name: 'Elsewhere', timeZone: 'UTC' })
    const far = await api()
      .post(`/api/v1/sites/${elsewhere.id}/consumables`)
      .set(as(org, 'owner'))
      .send({ kind: 'carbon', name: 'Carbon', unit: 'l', quantity: 2 })
    expect(far.status).toBe(201)
    const task = (body: object) =>
      api()
        .post(`/api/v1/tanks/${tankId}/care-tasks`)
        .set(as(org, 'owner'))
        .send({ kind: 'other', recurrence: { kind: 'interval', everyDays: 7 }, ...body })
    expect(badFields(await task({ consumableId: far.body.id, consumableAmount: 1 }))).toEqual(['consumableId'])
    expect(
      badFields(await api().post(`/api/v1/sites/${siteId}/consumables`).set(as(org, 'keeper')).send({ kind: 'salt', name: 'Salt', unit: 'kg', quantity: -1 })),
    ).toEqual(['quantity'])
    expect((await api().patch(`/api/v1/consumables/${far.body.id}`).set(as(other, 'owner')).send({ quantity: 1 })).status).toBe(404)
    expect((await api().get(`/api/v1/sites/${siteId}/consumables`).set(as(other, 'owner'))).status).toBe(404)
  })
})
