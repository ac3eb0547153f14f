import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DIGEST_WINDOW_HOURS, inDigestWindow, localHourAt, sendCareDigests } from '../../server/care/digest'
import { careDigest } from '../../server/mail/care-digest'
import { startOutboxSender, type OutboxSender } from '../../server/mail/sender'
import { createOrgIn, createTankRow, type TestOrg } from '../helpers/fixtures'
import { startMailBed, type MailBed } from './mail-bed'

// The morning digest over the real outbox, sender and fake SMTP server. Times are fixed: on
// Wednesday 4 March 2026 Berlin is UTC+1 (CET) and New York UTC−5 (EST), so 06:30Z is 07:30
// in Berlin and 01:30 in New York (zone offsets from the IANA tz database via Intl).
const HOUR = 7
const DAY_MS = 86_400_000
let bed: MailBed
let sender: OutboxSender
let org: TestOrg
let quiet: TestOrg

beforeAll(async () => {
  bed = await startMailBed()
  sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true })
  org = await createOrgIn(bed.ctx, 'Digest Org')
  quiet = await createOrgIn(bed.ctx, 'Quiet Digest Org')
})
afterAll(async () => {
  await sender.stop()
  await bed.close()
})

async function tank(o: TestOrg, siteId: number, name: string, stage = 'established') {
  return createTankRow(bed.ctx, o, {
    siteId,
    name,
    stage: stage as 'established',
    dimensions: null,
    volumeLitres: 120,
    volumeSource: 'entered',
    heater: null,
    lightSchedule: null,
  })
}
async function task(o: TestOrg, tankId: number, title: string, lastDoneAt: string, everyDays = 7) {
  return bed.ctx.models.CareTask.create({
    organizationId: o.organizationId,
    tankId,
    kind: 'other',
    title,
    recurrence: { kind: 'interval', everyDays },
    lastDoneAt: new Date(lastDoneAt),
  })
}
const onDuty = (o: TestOrg, siteId: number, role: 'owner' | 'keeper', weekday: number, start: string, end: string) =>
  bed.ctx.models.DutyShift.create({ organizationId: o.organizationId, siteId, userId: o.users[role].id, weekday, startTime: start, endTime: end })
const digestRows = () =>
  bed.ctx.sequelize.query<{ to_address: string; dedupe_key: string; subject: string }>(
    `SELECT to_address, dedupe_key, subject FROM mail_outbox WHERE kind = 'care_digest' ORDER BY id`,
    { type: QueryTypes.SELECT },
  )

describe('the digest window', () => {
  it('reads the hour on the site clock, including across a DST change', () => {
    expect(localHourAt('Europe/Berlin', Date.parse('2026-03-04T06:30:00Z'))).toBe(7)
    expect(localHourAt('America/New_York', Date.parse('2026-03-04T06:30:00Z'))).toBe(1)
    // After 29 March 2026 Berlin is UTC+2 (CEST): 05:30Z is already 07:30.
    expect(localHourAt('Europe/Berlin', Date.parse('2026-03-30T05:30:00Z'))).toBe(7)
    expect(localHourAt('Asia/Kolkata', Date.parse('2026-03-04T01:45:00Z'))).toBe(7) // UTC+5:30
    expect(inDigestWindow('Europe/Berlin', Date.parse('2026-03-04T05:59:00Z'), HOUR)).toBe(false)
    expect(inDigestWindow('Europe/Berlin', Date.parse('2026-03-04T06:00:00Z'), HOUR)).toBe(true)
    expect(inDigestWindow('Europe/Berlin', Date.parse(`2026-03-04T${String(5 + DIGEST_WINDOW_HOURS).padStart(2, '0')}:59:00Z`), HOUR)).toBe(true)
    expect(inDigestWindow('Europe/Berlin', Date.parse(`2026-03-04T${String(6 + DIGEST_WINDOW_HOURS).padStart(2, '0')}:00:00Z`), HOUR)).toBe(false)
  })
})

describe('the morning care digest', () => {
  it('mails the person on duty at the site the overdue, due-today and due-soon work per tank, once a day', async () => {
    const [shop, fishRoom] = org.siteIds as [number, number]
    const show = await tank(org, shop, 'Show <b>tank</b> & co')
    const back = await tank(org, shop, 'Back rack')
    const holding = await tank(org, shop, 'Holding Q2', 'quarantine')
    await bed.ctx.sequelize.query('UPDATE tanks SET stage_changed_at = $2 WHERE id = $1', {
      bind: [holding.id, new Date(Date.parse('2026-03-04T06:30:00Z') - 10 * DAY_MS - 3_600_000)],
    })
    // Done 22 Feb, every 7 days → due 1 Mar: overdue by 3. Done 25 Feb → due today. 27 Feb → due 6 Mar, in 2 days. 3 Mar → later.
    await task(org, show.id, 'Water change 10–15 %', '2026-02-22T10:00:00Z')
    await task(org, show.id, 'Glass <clean>', '2026-02-25T10:00:00Z')
    await task(org, back.id, 'Filter sponge rinse', '2026-02-27T10:00:00Z')
    await task(org, back.id, 'Test-kit check', '2026-03-03T10:00:00Z')
    // The keeper is on duty Wednesday mornings in the shop; the owner is not on duty then.
    await onDuty(org, shop, 'keeper', 2, '06:00', '14:00')
    await onDuty(org, shop, 'owner', 2, '14:00', '22:00')

    const early = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T05:59:00Z'))
    expect(early.filter((r) => r.site.id === shop)).toEqual([])
    expect(await digestRows()).toEqual([])

    const runs = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T06:30:00Z'))
    expect(runs.find((r) => r.site.id === shop)).toMatchObject({ day: '2026-03-04', outcome: 'sent', recipients: [org.users.keeper.email] })
    // New York is at 01:30: not its hour.
    expect(runs.find((r) => r.site.id === fishRoom)).toBeUndefined()

    await sender.runOnce()
    const mails = (await bed.mailbox()).filter((m) => m.subject.startsWith('Care today at Digest Org shop'))
    expect(mails).toHaveLength(1)
    const [mail] = mails as [(typeof mails)[number]]
    expect(mail.envelope_to).toEqual([org.users.keeper.email])
    expect(mail.subject).toBe('Care today at Digest Org shop: 1 overdue, 1 due today, 1 due soon')
    expect(mail.text_body).toContain('Care work at Digest Org shop for Wednesday 4 March 2026: 1 overdue, 1 due today, 1 due soon.')
    expect(mail.text_body).toContain('Show <b>tank</b> & co')
    expect(mail.text_body).toContain('  - Water change 10–15 %: overdue by 3 days')
    expect(mail.text_body).toContain('  - Glass <clean>: due today')
    expect(mail.text_body).toContain('  - Filter sponge rinse: due in 2 days')
    expect(mail.text_body).not.toContain('Test-kit check')
    // Ten days and an hour into quarantine: day 11 of 28, 18 days to go.
    expect(mail.text_body).toContain('Holding Q2: quarantine day 11 of 28, 18 days remaining')
    expect(mail.text_body).toContain('/care/today')
    expect(mail.html_body).toContain('Show &lt;b&gt;tank&lt;/b&gt; &amp; co')
    expect(mail.html_body).toContain('Glass &lt;clean&gt;')
    expect(mail.html_body).not.toContain('<b>tank</b>')
    expect(mail.html_body).not.toContain('<clean>')
    // Overdue first within the tank.
    expect(mail.text_body!.indexOf('Water change')).toBeLessThan(mail.text_body!.indexOf('Glass'))

    // Later the same morning, after a restart, or from a second instance at the same moment: nothing more.
    const again = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T07:45:00Z'))
    expect(again.find((r) => r.site.id === shop)?.outcome).toBe('already_sent')
    // Two runs racing on separate pooled connections (as two instances would): one sends.
    const both = await Promise.all([0, 1].map(() => sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-05T06:10:00Z'))))
    expect(both.map((runsOf) => runsOf.find((r) => r.site.id === shop)?.outcome).sort()).toEqual(['already_sent', 'sent'])
    const rows = (await digestRows()).filter((r) => r.dedupe_key.startsWith(`care_digest:site:${shop}:`))
    expect(rows.map((r) => r.dedupe_key)).toEqual([
      `care_digest:site:${shop}:2026-03-04:user:${org.users.keeper.id}`,
      // Thursday: nobody is rostered in the morning, so the backup contact (the owner) gets it.
      `care_digest:site:${shop}:2026-03-05:user:${org.users.owner.id}`,
    ])
  })

  it('uses the site’s own zone: New York gets its digest at 07:00 New York time', async () => {
    const fishRoom = org.siteIds[1] as number
    const rack = await tank(org, fishRoom, 'Breeding rack')
    await task(org, rack.id, 'Sponge rinse', '2026-02-20T15:00:00Z')
    // Nobody is rostered in the fish room: the digest goes to the backup contact, the owner.
    const at0659 = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T11:59:00Z'))
    expect(at0659.find((r) => r.site.id === fishRoom)).toBeUndefined()
    const at0710 = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T12:10:00Z'))
    expect(at0710.find((r) => r.site.id === fishRoom)).toMatchObject({ day: '2026-03-04', outcome: 'sent', recipients: [org.users.owner.email] })
    // Berlin is at 13:10 then: outside its window.
    expect(at0710.find((r) => r.site.id === org.siteIds[0])).toBeUndefined()
    await sender.runOnce()
    const mail = (await bed.mailbox()).find((m) => m.subject.startsWith('Care today at Digest Org fish room'))
    expect(mail?.envelope_to).toEqual([org.users.owner.email])
    expect(mail?.text_body).toContain('  - Sponge rinse: overdue by 5 days')
  })

  it('sends nothing when nothing is due, and skips snoozed tasks', async () => {
    const shop = quiet.siteIds[0] as number
    const t = await tank(quiet, shop, 'Calm tank')
    await task(quiet, t.id, 'Glass clean', '2026-03-03T10:00:00Z')
    const snoozed = await task(quiet, t.id, 'Media replace', '2026-01-01T10:00:00Z', 42)
    await snoozed.update({ snoozedUntil: new Date('2026-03-10T00:00:00Z'), snoozeReason: 'Parts on order' })
    await onDuty(quiet, shop, 'keeper', 2, '00:00', '00:00')
    const runs = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T06:30:00Z'))
    expect(runs.find((r) => r.site.id === shop)).toMatchObject({ outcome: 'nothing_due', recipients: [] })
    expect((await digestRows()).filter((r) => r.dedupe_key.startsWith(`care_digest:site:${shop}:`))).toEqual([])
  })
})

describe('the digest template', () => {
  it('escapes every name in the HTML and keeps the subject on one line', () => {
    const mail = careDigest({
      siteName: 'Shop "A"\nfront',
      dayLabel: 'Wednesday 4 March 2026',
      careTodayUrl: 'http://127.0.0.1:8080/care/today',
      tanks: [
        {
          name: "O'Brien's <tank>",
          url: 'http://127.0.0.1:8080/tanks/3',
          tasks: [{ title: '<script>x</script>', status: 'due_soon', dueOn: '2026-03-05', daysUntilDue: 1 }],
        },
      ],
      watch: [],
      supplies: [],
      suppliesUrl: 'http://127.0.0.1:8080/supplies?site=1',
    })
    expect(mail.subject).toBe('Care today at Shop "A" front: 1 due soon')
    expect(mail.html).toContain('O&#39;Brien&#39;s &lt;tank&gt;')
    expect(mail.html).toContain('&lt;script&gt;x&lt;/script&gt;: <strong style="color:#3e4c59">due tomorrow</strong>')
    expect(mail.html).not.toContain('<script>')
    expect(() =>
      careDigest({
        siteName: 'x',
        dayLabel: 'y',
        careTodayUrl: 'javascript:alert(1)',
        tanks: [],
        watch: [],
        supplies: [],
        suppliesUrl: 'http://127.0.0.1/supplies',
      }),
    ).toThrow(TypeError)
  })
})

describe('supplies in the digest', () => {
  it('lists what is at its reorder level or past its expiry date, even on a morning with no care due', async () => {
    const supplied = await createOrgIn(bed.ctx, 'Supply Digest Org')
    const shop = supplied.siteIds[0] as number
    const stock = (name: string, kind: 'salt' | 'reagent' | 'carbon', quantity: number, unit: string, lowAt: number | null, expiresOn: string | null = null) =>
      bed.ctx.models.Consumable.create({ organizationId: supplied.organizationId, siteId: shop, kind, name, unit, quantity, lowAt, expiresOn })
    await stock('Marine salt <25 kg>', 'salt', 1.5, 'kg', 5)
    await stock('Ammonia reagent', 'reagent', 40, 'mL', 10, '2026-03-03')
    await stock('Carbon', 'carbon', 800, 'g', 500)
    await onDuty(supplied, shop, 'keeper', 2, '00:00', '00:00')
    const runs = await sendCareDigests(bed.ctx, { hour: HOUR }, new Date('2026-03-04T06:30:00Z'))
    expect(runs.find((r) => r.site.id === shop)).toMatchObject({ outcome: 'sent', recipients: [supplied.users.keeper.email] })
    const [row] = await bed.ctx.sequelize.query<{ subject: string; text_body: string; html_body: string }>(
      `SELECT subject, text_body, html_body FROM mail_outbox WHERE kind = 'care_digest' AND starts_with(dedupe_key, $1)`,
      { bind: [`care_digest:site:${shop}:`], type: QueryTypes.SELECT },
    )
    expect(row!.subject).toMatch(/: 2 supplies to reorder$/)
    expect(row!.text_body).toContain(`Supplies to reorder (${bed.ctx.config.publicUrl}/supplies?site=${shop}):`)
    // Good through 3 March on the site's clock, spent on the 4th; the carbon is above its level.
    expect(row!.text_body).toContain('  - Ammonia reagent: expired 3 Mar 2026: replace before the next test')
    expect(row!.text_body).toContain('  - Marine salt <25 kg>: 1.5 kg left (low at 5)')
    expect(row!.text_body).not.toContain('Carbon')
    expect(row!.html_body).toContain('<li>Marine salt &lt;25 kg&gt;: 1.5 kg left (low at 5)</li>')
  })
})
