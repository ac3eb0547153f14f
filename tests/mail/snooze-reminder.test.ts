import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { currentOccurrenceEnd, remindEndingSnoozes } from '../../server/incidents/snooze-reminders'
import { startTestApp, type TestOrg } from '../helpers/app'
import { createTankWithDevice } from '../helpers/fixtures'

const MIN = 60_000
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Snooze Reminder Org')
})
afterAll(() => t.close())

const mails = () =>
  t.ctx.sequelize.query<{ kind: string; to_address: string; subject: string; html_body: string }>(
    `SELECT kind, to_address, subject, html_body FROM mail_outbox WHERE kind = 'snooze_ending' ORDER BY id`,
    { type: QueryTypes.SELECT },
  )

describe('the snooze reminder', () => {
  it('mails the person who set it once, a quarter of an hour before it ends', async () => {
    const node = await createTankWithDevice(t.ctx, org, 'Tank <i>7</i>')
    const now = Date.now()
    await t.ctx.models.Snooze.create({
      organizationId: org.organizationId,
      tankId: node.tankId,
      reason: 'Glass cleaning',
      startsAt: new Date(now - 60 * MIN),
      endsAt: new Date(now + 30 * MIN),
      createdBy: org.users.keeper.id,
    })
    expect(await remindEndingSnoozes(t.ctx, now)).toBe(0) // 30 min to go: not yet
    expect(await remindEndingSnoozes(t.ctx, now + 16 * MIN)).toBe(1)
    expect(await remindEndingSnoozes(t.ctx, now + 20 * MIN)).toBe(0) // once
    const [mail] = await mails()
    expect(mail).toMatchObject({ kind: 'snooze_ending', to_address: org.users.keeper.email })
    expect(mail.subject).toMatch(/^Snooze on Tank <i>7<\/i> ends at /)
    expect(mail.html_body).toContain('Tank &lt;i&gt;7&lt;/i&gt;')
  })

  it('finds the current occurrence of a weekly snooze and none outside it', () => {
    const start = Date.parse('2026-03-02T08:00:00Z')
    const weekly = { startsAt: new Date(start), endsAt: new Date(start + 2 * 3600_000), weekly: true, repeatUntil: new Date(start + 30 * 86400_000) }
    expect(currentOccurrenceEnd(weekly, start + 7 * 86400_000 + 3600_000)).toBe(start + 7 * 86400_000 + 2 * 3600_000)
    expect(currentOccurrenceEnd(weekly, start + 7 * 86400_000 + 3 * 3600_000)).toBeNull()
    expect(currentOccurrenceEnd(weekly, start + 35 * 86400_000 + 3600_000)).toBeNull()
  })
})
