import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createMailNotifier } from '../../server/incidents/mail-notifier'
import { remindEndingSnoozes } from '../../server/incidents/snooze-reminders'
import { startOutboxSender, type OutboxSender } from '../../server/mail/sender'
import { createIncidentRow, createOrgIn, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startMailBed, type MailBed } from './mail-bed'

// Mails read from the fake SMTP server for two organisations served by one process, one on a
// 12-hour clock and one on the default 24-hour clock. 2026-03-03 14:05 UTC is 15:05 in Berlin,
// the fixtures' first site (CET, UTC+1; offset from the IANA tz database via Intl).
const AT = new Date('2026-03-03T14:05:00Z')
let bed: MailBed
let sender: OutboxSender
let twelve: TestOrg
let twentyFour: TestOrg

beforeAll(async () => {
  bed = await startMailBed()
  sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true })
  twelve = await createOrgIn(bed.ctx, 'Twelve Hour Org')
  twentyFour = await createOrgIn(bed.ctx, 'Day Clock Org')
  await bed.ctx.models.Organization.update({ clockStyle: '12h' }, { where: { id: twelve.organizationId } })
})
afterAll(async () => {
  await sender.stop()
  await bed.close()
})

async function delivered(to: string, subject: RegExp) {
  await sender.runOnce()
  const mail = (await bed.mailbox()).find((m) => m.envelope_to.includes(to) && subject.test(m.subject))
  expect(mail, `a mail to ${to} matching ${subject}`).toBeDefined()
  return mail!
}

async function escalate(org: TestOrg) {
  const { tankId } = await createTankWithDevice(bed.ctx, org, 'Sales row 4')
  const incident = await createIncidentRow(bed.ctx, org, tankId, { openedAt: AT, conditionSince: AT, latestAt: AT })
  await bed.ctx.sequelize.transaction((transaction) => createMailNotifier(bed.ctx).notify('escalated', incident, transaction))
  return delivered(org.users.owner.email, /escalat/i)
}

describe('times in mails follow the organisation clock', () => {
  it('an escalation on a 12-hour clock reads 3:05 pm, with no 15:05 in text or HTML', async () => {
    const mail = await escalate(twelve)
    expect(mail.text_body).toContain('Tue, 3 Mar 2026, 3:05 pm GMT+1')
    expect(mail.html_body).toContain('3:05 pm')
    expect(mail.text_body).not.toContain('15:05')
    expect(mail.html_body).not.toContain('15:05')
  })

  it('the same escalation for an organisation on the 24-hour clock reads 15:05', async () => {
    const mail = await escalate(twentyFour)
    expect(mail.text_body).toContain('Tue, 3 Mar 2026, 15:05 GMT+1')
    expect(mail.text_body).not.toMatch(/\d:05 [ap]m/)
  })

  it('the snooze reminder names its end on the 12-hour clock', async () => {
    const { tankId } = await createTankWithDevice(bed.ctx, twelve, 'Quarantine 2')
    await bed.ctx.models.Snooze.create({
      organizationId: twelve.organizationId,
      tankId,
      reason: 'Glass cleaning',
      startsAt: new Date(AT.getTime() - 3600_000),
      endsAt: AT,
      createdBy: twelve.users.keeper.id,
    })
    expect(await remindEndingSnoozes(bed.ctx, AT.getTime() - 10 * 60_000)).toBe(1)
    const mail = await delivered(twelve.users.keeper.email, /^Snooze on Quarantine 2/)
    expect(mail.subject).toBe('Snooze on Quarantine 2 ends at Tue, 3 Mar 2026, 3:05 pm GMT+1')
    expect(mail.text_body).not.toContain('15:05')
  })
})
