import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { renderBuildReportPdf } from '../../server/builds/report-pdf'
import { buildReportService } from '../../server/builds/build-report'
import { buildsService } from '../../server/builds/builds'
import { buildPlanSchema } from '@shared/schemas/build'
import type { TestOrg } from '../helpers/app'
import { localDaysAgo, PLAN_60, TANK_60 } from '../helpers/build-plan'
import { pdfText } from '../helpers/pdf-text'
import { as, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

let t: CareTestApp
let org: TestOrg
let tankId: number
const DAY = 86_400_000

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Build Report Org')
  tankId = await newTank(t, org, { name: 'Client lounge 60', kind: 'planted', dimensions: TANK_60, heater: null })
  const keeper: UserActor = {
    kind: 'user',
    userId: org.users.keeper.id,
    organizationId: org.organizationId,
    role: 'keeper',
    siteIds: null,
    sessionId: 'report',
  }
  await buildsService(t.ctx).savePlan(keeper, tankId, buildPlanSchema.parse(PLAN_60))
  await buildsService(t.ctx).start(keeper, tankId, { filledOn: localDaysAgo('Europe/Berlin', 8) })
  await t
    .api()
    .post(`/api/v1/tanks/${tankId}/test-kit-entries`)
    .set(as(org, 'keeper'))
    .send({
      takenAt: new Date(Date.now() - 3 * DAY).toISOString(),
      values: [
        { metric: 'ammonia', value: 1.5, unit: 'mg/L' },
        { metric: 'nitrite', value: 0.5, unit: 'mg/L' },
        { metric: 'ph', value: 7.2, unit: 'pH' },
      ],
    })
  await t.api().post(`/api/v1/tanks/${tankId}/build/steps/conditioner/done`).set(as(org, 'keeper')).send({})
  // A photo row (the report lists photos, it does not embed them, so no image bytes are needed): build day 2.
  await t.ctx.models.Photo.create({
    organizationId: org.organizationId,
    tankId,
    careLogEntryId: null,
    caption: 'Hardscape placed',
    takenAt: new Date(Date.now() - 7 * DAY),
    uploadedBy: org.users.keeper.id,
    contentType: 'image/jpeg',
    displayKey: 'k/d.jpg',
    displayWidth: 1600,
    displayHeight: 1200,
    displayBytes: 1000,
    thumbnailKey: 'k/t.jpg',
    thumbnailWidth: 320,
    thumbnailHeight: 240,
    originalFormat: 'jpeg',
  })
})
afterAll(() => t.close())

describe('build report', () => {
  it('lists equipment, substrate, hardscape, readings, the timeline, the care plan and the cautions', async () => {
    const actor: UserActor = {
      kind: 'user',
      userId: org.users.viewer.id,
      organizationId: org.organizationId,
      role: 'viewer',
      siteIds: null,
      sessionId: 'report',
    }
    const report = await buildReportService(t.ctx).load(actor, tankId)
    // Wrapped lines come out as separate blocks: join them and fold the spaces.
    const text = pdfText(await renderBuildReportPdf(report, { compress: false }))
      .join(' ')
      .replace(/\s+/g, ' ')
    expect(text).toContain('Tankwarden build report')
    expect(text).toContain('Client lounge 60')
    expect(text).toContain('60 × 30 × 36 cm')
    expect(text).toContain('build day 9 of about 28')
    expect(text).toContain('Filter: Hang-on filter, 300 L/h; media in the order the water passes them: Coarse sponge › Ceramic rings › Fine sponge › Carbon')
    expect(text).toContain('Bring pH from 7.6 to 6.8–7.2, at most 0.2 a day, testing daily (7.4 › 7.2)')
    expect(text).toContain('Heater: 75 W (suggested 75 W')
    expect(text).toContain('Nutrient soil (baked clay granules): 4.0 cm, 7.2 L, 6.5 kg, 3 bags')
    expect(text).toContain('Bed in all: 6.0 cm, 10.8 L, 11.5 kg')
    expect(text).toContain('Grey stone (rock): 5.0 kg, 1.9 L')
    expect(text).toContain('Water after substrate and hardscape: 47.5 L')
    expect(text).toContain('Conditioner (Tap-water conditioner): 23.7 mL for 47.5 L')
    expect(text).toContain('Filled weight about 82 kg')
    expect(text).toContain('ammonia 1.50 mg/L, nitrite 0.50 mg/L, pH 7.20')
    expect(text).toMatch(/Day 1 · done \d+ \w+ \d{4} · Fill the tank and add conditioner/)
    expect(text).toContain('Partial water change: every 7 days')
    expect(text).toMatch(/Photos Day 2 · \d+ \w+ \d{4} · Hardscape placed/)
    expect(text).toContain('ask a structural engineer when unsure')
    expect(text).toContain('RCD/GFCI')
    expect(text).toContain('follow the product label')
  })

  it('mails the report with the PDF attached', async () => {
    const res = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/build/report/mail`)
      .set(as(org, 'keeper'))
      .send({ emails: ['client@example.test'] })
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ queued: 1 })
    const [row] = await t.ctx.sequelize.query<{ subject: string; attachments: Array<{ filename: string; contentType: string }> }>(
      `SELECT subject, attachments FROM mail_outbox WHERE to_address = 'client@example.test'`,
      { type: 'SELECT' as never },
    )
    expect(row!.subject).toBe('Tankwarden build report: Client lounge 60')
    expect(row!.attachments[0]).toMatchObject({ contentType: 'application/pdf' })
    expect(row!.attachments[0]!.filename).toMatch(/^tankwarden-build-client-lounge-60-\d{4}-\d{2}-\d{2}\.pdf$/)
    const bad = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/build/report/mail`)
      .set(as(org, 'keeper'))
      .send({ emails: ['not an address'] })
    expect(bad.status).toBe(400)
  })

  it('serves the PDF', async () => {
    const res = await t
      .api()
      .get(`/api/v1/tanks/${tankId}/build/report/pdf`)
      .set(as(org, 'viewer'))
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => cb(null, Buffer.concat(chunks)))
      })
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect((res.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-')
  })
})
