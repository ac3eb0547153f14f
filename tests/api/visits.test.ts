import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, type TestOrg } from '../helpers/app'
import { pdfText } from '../helpers/pdf-text'
import { renderVisitPdf } from '../../server/visits/report-pdf'
import { makeImage, startPhotoTestApp, type PhotoTestApp } from './photos-helpers'

// A service visit: planned by the owner, worked and closed by the technician, read by the client.
let t: PhotoTestApp
let org: TestOrg
let clientId: number
let clientViewerToken: string
const tanks = { reef: 0, lobby: 0, other: 0 }
const HOUR = 3600_000

const api = (method: 'get' | 'post' | 'patch' | 'delete', path: string, token: string, body?: object) => {
  const req = t.api()[method](`/api/v1${path}`).set(bearer(token))
  return body ? req.send(body) : req
}
const owner = () => org.users.owner.token
const keeper = () => org.users.keeper.token

async function planVisit(overrides: Record<string, unknown> = {}) {
  const res = await api('post', '/visits', owner(), {
    clientId,
    siteId: org.siteIds[0],
    technicianId: org.users.keeper.id,
    startsAt: new Date(Date.now() - HOUR).toISOString(),
    endsAt: new Date(Date.now() + HOUR).toISOString(),
    tankIds: [tanks.reef, tanks.lobby],
    ...overrides,
  })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body as { id: number; due: Array<{ id: number; tankId: number; title: string }> }
}

beforeAll(async () => {
  t = await startPhotoTestApp()
  org = await t.createOrg('Visit Org')
  const client = await api('post', '/clients', owner(), { kind: 'company', name: 'Harbour Dental', email: 'front@harbour.example' })
  clientId = client.body.id
  await t.ctx.models.Site.update({ address: 'Kaistraße 4, 10115 Berlin' }, { where: { id: org.siteIds[0] } })
  for (const [key, name] of [
    ['reef', 'Waiting room reef'],
    ['lobby', 'Lobby planted'],
  ] as const) {
    tanks[key] = (
      await api(
        'post',
        '/tanks',
        owner(),
        sampleTank(org.siteIds[0], { name, clientId, targets: { ph: { min: 6.8, max: 7.6 }, nitrate: { min: 0, max: 20 } } }),
      )
    ).body.id
  }
  tanks.other = (await api('post', '/tanks', owner(), sampleTank(org.siteIds[0], { name: 'Shop display' }))).body.id
  const invite = await api('post', '/users/invitations', owner(), { email: 'lindqvist@harbour.example', name: 'Dr Lindqvist', role: 'viewer', clientId })
  const token = new URL(invite.body.link, 'http://x').searchParams.get('token')!
  clientViewerToken = (await t.api().post('/api/v1/invitations/accept').send({ token, password: 'a-long-enough-password' })).body.token
})
afterAll(() => t?.close())

describe('service visits', () => {
  it("plans only the client's tanks at the visit's site, with an active owner or keeper", async () => {
    const wrongTank = await api('post', '/visits', owner(), {
      clientId,
      siteId: org.siteIds[0],
      technicianId: org.users.keeper.id,
      startsAt: new Date().toISOString(),
      endsAt: new Date(Date.now() + HOUR).toISOString(),
      tankIds: [tanks.other],
    })
    expect(wrongTank.status).toBe(400)
    expect(wrongTank.body.error.fields).toHaveProperty('tankIds')
    const viewerAsTechnician = await api('post', '/visits', owner(), {
      clientId,
      siteId: org.siteIds[0],
      technicianId: org.users.viewer.id,
      startsAt: new Date().toISOString(),
      endsAt: new Date(Date.now() + HOUR).toISOString(),
      tankIds: [tanks.reef],
    })
    expect(viewerAsTechnician.status).toBe(400)
    expect((await api('post', '/visits', keeper(), {})).status).toBe(403)
  })

  it('shows the round with the address and the care due at each stop', async () => {
    // Starting now, so it is on today's round even in the hour after the site's midnight.
    const visit = await planVisit({ startsAt: new Date().toISOString() })
    const round = await api('get', '/rounds', keeper())
    expect(round.status).toBe(200)
    const stop = round.body.stops.find((s: { id: number }) => s.id === visit.id)
    expect(stop).toMatchObject({ siteAddress: 'Kaistraße 4, 10115 Berlin', clientName: 'Harbour Dental', state: 'planned' })
    expect(stop.due.filter((d: { tankId: number }) => d.tankId === tanks.reef).map((d: { title: string }) => d.title)).toContain('Partial water change')
    await api('delete', `/visits/${visit.id}`, owner()).expect(204)
  })

  it('closing refuses a task of a tank not on the visit and writes nothing', async () => {
    const visit = await planVisit()
    const otherTask = await t.ctx.models.CareTask.findOne({ where: { tankId: tanks.other } })
    const res = await api('post', `/visits/${visit.id}/close`, keeper(), { tanks: [{ tankId: tanks.reef, doneTaskIds: [otherTask!.id] }] })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('tanks.0.doneTaskIds')
    expect(await t.ctx.models.CareLogEntry.count({ where: { tankId: [tanks.reef, tanks.lobby] } })).toBe(0)
    expect((await t.ctx.models.Visit.findByPk(visit.id))!.state).toBe('planned')
    // Another keeper's round is not this keeper's to close.
    const owners = await planVisit({ technicianId: org.users.owner.id })
    expect((await api('post', `/visits/${owners.id}/close`, keeper(), {})).status).toBe(403)
    await api('delete', `/visits/${visit.id}`, owner()).expect(204)
    await api('delete', `/visits/${owners.id}`, owner()).expect(204)
  })

  it('a closed visit marks the ticked tasks done, logs the care and mails the client the report with its PDF', async () => {
    const visit = await planVisit()
    expect((await api('post', `/visits/${visit.id}/start`, keeper())).body.state).toBe('started')
    const kit = await api('post', `/tanks/${tanks.reef}/test-kit-entries`, keeper(), {
      values: [
        { metric: 'ph', value: 7.2, unit: 'pH' },
        { metric: 'nitrate', value: 40, unit: 'mg/L' },
      ],
    })
    expect(kit.status, JSON.stringify(kit.body)).toBe(201)
    const photo = await t
      .api()
      .post(`/api/v1/tanks/${tanks.reef}/photos`)
      .set(bearer(keeper()))
      .attach('photo', await makeImage('jpeg', 320, 240), 'reef.jpg')
    expect(photo.status).toBe(201)
    const reefTasks = visit.due.filter((d) => d.tankId === tanks.reef)
    const water = reefTasks.find((d) => d.title === 'Partial water change')!
    const glass = reefTasks.find((d) => d.title === 'Clean the glass')!
    const closed = await api('post', `/visits/${visit.id}/close`, keeper(), {
      notes: 'Nitrate high: feeding cut back, next change brought forward.',
      materials: [{ what: 'water changed', amount: 40, unit: 'L' }],
      photoIds: [photo.body.id],
      tanks: [
        { tankId: tanks.reef, doneTaskIds: [water.id, glass.id], kitEntryId: kit.body.id, notes: 'Algae on the back glass' },
        { tankId: tanks.lobby, doneTaskIds: [] },
      ],
    })
    expect(closed.status, JSON.stringify(closed.body)).toBe(200)
    expect(closed.body).toMatchObject({ state: 'closed', photoIds: [photo.body.id] })
    const reefWork = closed.body.work.find((w: { tankId: number }) => w.tankId === tanks.reef)
    expect(reefWork.doneTasks.map((d: { title: string }) => d.title).sort()).toEqual(['Clean the glass', 'Partial water change'])
    // Against the tank's own band 0–20 mg/L (set above): 40 is above it, pH 7.2 inside 6.8–7.6.
    expect(reefWork.readings.map((r: { metric: string; verdict: string }) => [r.metric, r.verdict])).toEqual([
      ['ph', 'in_band'],
      ['nitrate', 'high'],
    ])
    expect(reefWork.next.length).toBeGreaterThan(0)

    const tasks = await t.ctx.models.CareTask.findAll({ where: { id: [water.id, glass.id] } })
    for (const task of tasks) expect(task.lastDoneAt).not.toBeNull()
    const log = await t.ctx.models.CareLogEntry.findAll({ where: { tankId: tanks.reef }, order: [['id', 'ASC']] })
    expect(
      log
        .filter((e) => e.kind === 'task_done')
        .map((e) => e.careTaskId)
        .sort(),
    ).toEqual([water.id, glass.id].sort())
    expect(log.find((e) => e.kind === 'note')!.text).toContain('40 L water changed')

    const mails = await t.ctx.models.OutboxMessage.findAll({ where: { kind: 'visit_report' } })
    expect(mails.map((m) => m.toAddress).sort()).toEqual(['front@harbour.example', 'lindqvist@harbour.example'])
    expect(mails[0].htmlBody).toContain('nitrate 40 mg/L: above band')
    const pdf = mails[0].attachments[0]
    expect(pdf).toMatchObject({ contentType: 'application/pdf' })
    expect(Buffer.from(pdf.base64, 'base64').subarray(0, 5).toString()).toBe('%PDF-')
    // The same report, uncompressed so its text can be read back.
    const text = pdfText(await renderVisitPdf(t.ctx, closed.body, '24h', { compress: false })).join('\n')
    expect(text).toContain('Waiting room reef')
    expect(text).toContain('nitrate 40 mg/L: above band')
    expect(text).toContain('Photos: 1')
    expect(text).toMatch(/on site \d+ \w+, \d{2}:\d{2} [A-Z]/)
    // On a 12-hour clock the same times read "9:05 am CET", and no "09:05 CET" is left.
    const twelve = pdfText(await renderVisitPdf(t.ctx, closed.body, '12h', { compress: false })).join('\n')
    expect(twelve).toMatch(/on site \d+ \w+, \d{1,2}:\d{2} [ap]m [A-Z]/)
    expect(twelve).not.toMatch(/\d{2}:\d{2} [A-Z]/)

    // Closed once: a second close is a conflict.
    expect((await api('post', `/visits/${visit.id}/close`, keeper(), {})).status).toBe(409)
  })

  it("the client's person reads the closed visit reports of the client, and nothing of another client", async () => {
    const list = await api('get', '/visits', clientViewerToken)
    expect(list.status).toBe(200)
    expect(list.body.map((v: { state: string }) => v.state)).toEqual(['closed'])
    const id = list.body[0].id
    expect((await api('get', `/visits/${id}`, clientViewerToken)).status).toBe(200)
    const pdf = await api('get', `/visits/${id}/report/pdf`, clientViewerToken)
    expect(pdf.status).toBe(200)
    expect(pdf.headers['content-type']).toBe('application/pdf')
    const other = await api('post', '/clients', owner(), { kind: 'person', name: 'Someone Else' })
    await t.ctx.models.User.update({ clientId: other.body.id }, { where: { email: 'lindqvist@harbour.example' } })
    const relisted = await t.api().post('/api/v1/auth/sign-in').send({ email: 'lindqvist@harbour.example', password: 'a-long-enough-password' })
    expect((await api('get', '/visits', relisted.body.token)).body).toEqual([])
    expect((await api('get', `/visits/${id}`, relisted.body.token)).status).toBe(404)
    await t.ctx.models.User.update({ clientId }, { where: { email: 'lindqvist@harbour.example' } })
  })

  it("a visit not closed by the end of its day shows on the next morning's overview", async () => {
    const day = 24 * HOUR
    const late = await planVisit({ startsAt: new Date(Date.now() - 2 * day).toISOString(), endsAt: new Date(Date.now() - 2 * day + HOUR).toISOString() })
    const overview = await api('get', '/overview', owner())
    const site = overview.body.sites.find((x: { site: { id: number } }) => x.site.id === org.siteIds[0])
    expect(site.overnight.visitsLeftOpen).toEqual([expect.objectContaining({ id: late.id, clientName: 'Harbour Dental', technician: 'keeper of Visit Org' })])
    expect((await api('get', `/visits/${late.id}`, owner())).body.overdue).toBe(true)
  })
})
