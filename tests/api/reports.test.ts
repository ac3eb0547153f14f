import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { authService } from '../../server/people/auth'
import type { Report } from '@shared/schemas/reports'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { pdfPageCount, pdfText } from '../helpers/pdf-text'
import { EXPECTED, seedReportWeek, WEEK } from '../helpers/report-week'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Marrowfen Aquatics')
  tankId = (await seedReportWeek(t.ctx, org)).id
})
afterAll(() => t?.close())

const get = (path: string, token = org.users.owner.token) => t.api().get(`/api/v1${path}`).set(bearer(token))

describe('the weekly report of a tank, from seeded records', () => {
  let report: Report
  beforeAll(async () => {
    const res = await get(`/tanks/${tankId}/report?period=week&date=${WEEK.date}`)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    report = res.body
  })

  it('covers the ISO week on the site calendar', () => {
    expect(report.subject).toMatchObject({ kind: 'tank', id: tankId, name: 'Marrowfen display', timeZone: 'Europe/Berlin' })
    expect(report.period).toMatchObject({
      kind: 'week',
      startDate: WEEK.startDate,
      endDate: WEEK.endDate,
      from: new Date(WEEK.from).toISOString(),
      inProgress: false,
      previousDate: '2026-11-01',
      nextDate: '2026-11-09',
    })
    expect(report.tanks).toHaveLength(1)
  })

  it('temperature: time in band, min, max, mean and the 12 h gap', () => {
    const temp = report.tanks[0]!.metrics.find((m) => m.metric === 'temperature')!
    const e = EXPECTED.temperature
    expect(temp.band).toEqual({ min: 24, max: 28 })
    expect(temp.readings).toBe(e.readings)
    expect(temp.coveragePercent).toBeCloseTo(e.coveragePercent, 9)
    expect(temp.timeInBandPercent).toBeCloseTo(e.timeInBandPercent, 9)
    expect(temp.aboveMs).toBe(e.aboveMs)
    expect(temp.mean).toBeCloseTo(e.mean, 9)
    expect([temp.min, temp.max]).toEqual([e.min, e.max])
    expect(temp.gaps).toEqual(e.gaps)
    expect(temp.series.length).toBeGreaterThan(100)
    expect(temp.series.some(([, v]) => v === null)).toBe(true)
  })

  it('pH: hourly, always in band', () => {
    const ph = report.tanks[0]!.metrics.find((m) => m.metric === 'ph')!
    expect(ph).toMatchObject({ readings: EXPECTED.ph.readings, coveragePercent: 100, timeInBandPercent: 100, gaps: [] })
    expect(ph.mean).toBeCloseTo(EXPECTED.ph.mean, 9)
  })

  it('incidents opened in the week with time to acknowledge and resolve', () => {
    const tank = report.tanks[0]!
    expect(tank.incidentSummary).toEqual(EXPECTED.incidents)
    expect(tank.incidents.map((i) => [i.timeToAcknowledgeMs, i.timeToResolveMs])).toEqual([
      [600_000, 4_200_000],
      [1_800_000, null],
    ])
  })

  it('care done versus due, water changed, livestock changes, photos', () => {
    const tank = report.tanks[0]!
    expect({ due: tank.care.due, done: tank.care.done }).toEqual(EXPECTED.care)
    expect(tank.care.tasks.map((c) => [c.title, c.due, c.done])).toEqual([
      ['Clean the glass', 2, 1],
      ['Weekly water change', 1, 1],
    ])
    expect(tank.water).toEqual(EXPECTED.water)
    expect(tank.livestock).toMatchObject(EXPECTED.livestock)
    expect(tank.livestock.changes.map((c) => c.kind)).toEqual(['added', 'lost', 'removed'])
    expect(tank.photos).toEqual([])
  })

  it('a month report of the site holds the tank with the same week inside it', async () => {
    const res = await get(`/sites/${org.siteIds[0]}/report?period=month&date=2026-11-15`)
    expect(res.status).toBe(200)
    expect(res.body.period).toMatchObject({ kind: 'month', startDate: '2026-11-01', endDate: '2026-12-01', label: 'November 2026' })
    const tank = (res.body as Report).tanks.find((x) => x.tankId === tankId)!
    expect(tank.water).toEqual(EXPECTED.water)
    expect(tank.incidentSummary.opened).toBe(2)
    // Readings stop at 9 November 00:00: the rest of the month is one gap.
    const temp = tank.metrics.find((m) => m.metric === 'temperature')!
    expect(temp.gaps.at(-1)).toMatchObject({ to: '2026-11-30T23:00:00.000Z' })
  })

  it('the PDF parses: one A4 page with the tank, its figures and the units', async () => {
    const res = await get(`/tanks/${tankId}/report/pdf?period=week&date=${WEEK.date}`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => cb(null, Buffer.concat(chunks)))
      })
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['content-disposition']).toBe('attachment; filename="tankwarden-report-marrowfen-display-week-2026-11-02.pdf"')
    const pdf = res.body as Buffer
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    expect(pdf.subarray(-6).toString()).toContain('%%EOF')
    expect(pdfPageCount(pdf)).toBeGreaterThanOrEqual(1)
  })

  it('the uncompressed PDF holds the expected text', async () => {
    const { renderReportPdf } = await import('../../server/reports/pdf')
    const pdf = await renderReportPdf(report, { compress: false })
    const text = pdfText(pdf).join('')
    expect(pdfPageCount(pdf)).toBe(1)
    expect(text).toContain('Marrowfen display')
    expect(text).toContain('Week 45 of 2026 (Mon 2 Nov to Sun 8 Nov 2026)')
    expect(text).toContain('Temperature — target 24.0–28.0 °C')
    expect(text).toContain(`in band ${EXPECTED.temperature.timeInBandPercent.toFixed(1)} % · min 26.0 °C · max 29.0 °C`)
    expect(text).toContain('1 gap (12 h 00 min)')
    expect(text).toContain('2 opened, 1 still open · mean time to acknowledge 20 min · to resolve 1 h 10 min')
    expect(text).toContain('2 done of 3 due')
    expect(text).toContain('40.0 L changed in 1 water change')
    expect(text).toContain('added 6 · removed 2 · lost 1')
    expect(text).toContain('aquatic veterinarian')
  })

  it('an open band reads ≥ in the PDF (the maths font is embedded)', async () => {
    const { renderReportPdf } = await import('../../server/reports/pdf')
    const open = structuredClone(report)
    open.tanks[0]!.metrics[1]!.band = { min: 6.5, max: null }
    expect(pdfText(await renderReportPdf(open, { compress: false })).join('')).toContain('pH — target ≥ pH 6.50')
  })
})

describe('report input and scope', () => {
  it('bad query values are 400s naming the field', async () => {
    const bad = await get(`/tanks/${tankId}/report?period=year`)
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('period')
    const date = await get(`/tanks/${tankId}/report?date=2026-02-30`)
    expect(date.status).toBe(400)
    expect(date.body.error.fields).toHaveProperty('date')
    const future = await get(`/tanks/${tankId}/report?date=2099-01-05`)
    expect(future.status).toBe(400)
    expect(future.body.error.message).toMatch(/not started/)
  })

  it('keepers and viewers read it; a viewer limited to another site, and another organization, get 404', async () => {
    expect((await get(`/tanks/${tankId}/report?date=${WEEK.date}`, org.users.keeper.token)).status).toBe(200)
    expect((await get(`/tanks/${tankId}/report?date=${WEEK.date}`, org.users.viewer.token)).status).toBe(200)
    const client = await t.ctx.models.User.create({
      organizationId: org.organizationId,
      email: `client-${process.pid}@marrowfen.example`,
      name: 'Site B client',
      role: 'viewer',
      passwordHash: 'x',
    })
    await t.ctx.models.UserSite.create({ userId: client.id, siteId: org.siteIds[1]! })
    await client.reload({ include: [{ association: 'sites' }] })
    const { token } = await authService(t.ctx).openSession(client)
    expect((await get(`/tanks/${tankId}/report?date=${WEEK.date}`, token)).status).toBe(404)
    expect((await get(`/sites/${org.siteIds[0]}/report?date=${WEEK.date}`, token)).status).toBe(404)
    expect((await get(`/sites/${org.siteIds[1]}/report?date=${WEEK.date}`, token)).status).toBe(200)
    const other = await t.createOrg('Other shop')
    expect((await get(`/tanks/${tankId}/report/pdf?date=${WEEK.date}`, other.users.owner.token)).status).toBe(404)
    expect((await t.api().get(`/api/v1/tanks/${tankId}/report`)).status).toBe(401)
  })
})
