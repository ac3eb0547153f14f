import { Op } from 'sequelize'
import type { AppContext } from '../context'
import { enqueueMail } from '../mail'
import { escapeHtml, layout } from '../mail'
import { formatInZone } from '@shared/time'
import { clockStyleOf } from '../people'

export const REMIND_BEFORE_MS = 15 * 60_000
const WEEK_MS = 7 * 86400_000

/** The end of the occurrence of a (possibly weekly) snooze that covers `now`, or null. */
export function currentOccurrenceEnd(s: { startsAt: Date; endsAt: Date; weekly: boolean; repeatUntil: Date | null }, now: number): number | null {
  const start = s.startsAt.getTime()
  const length = s.endsAt.getTime() - start
  if (now < start) return null
  if (!s.weekly) return now < start + length ? start + length : null
  if (s.repeatUntil && now >= s.repeatUntil.getTime()) return null
  const occurrenceStart = start + Math.floor((now - start) / WEEK_MS) * WEEK_MS
  return now < occurrenceStart + length ? occurrenceStart + length : null
}

/**
 * Tells the person who set a snooze, a quarter of an hour before it ends, that alerts for the tank
 * are about to resume. One mail per occurrence (the dedupe key names its end).
 */
export async function remindEndingSnoozes(ctx: AppContext, now = Date.now()) {
  const { models } = ctx
  const snoozes = await models.Snooze.findAll({
    where: { cancelledAt: null, createdBy: { [Op.ne]: null }, startsAt: { [Op.lte]: new Date(now) } },
  })
  let sent = 0
  for (const s of snoozes) {
    const end = currentOccurrenceEnd(s, now)
    if (end === null || end - now > REMIND_BEFORE_MS) continue
    if (s.remindedAt && s.remindedAt.getTime() >= end - REMIND_BEFORE_MS) continue
    const [user, tank] = await Promise.all([models.User.findByPk(s.createdBy!), models.Tank.findByPk(s.tankId, { include: [{ association: 'site' }] })])
    if (!user?.active || !tank) continue
    const zone = tank.site?.timeZone ?? 'UTC'
    const until = formatInZone(new Date(end).toISOString(), zone, await clockStyleOf(ctx, s.organizationId))
    const text = `The snooze you set on ${tank.name} ("${s.reason}") ends at ${until}. From then on its watch rules alert the people on duty again.`
    const id = await enqueueMail(ctx, {
      kind: 'snooze_ending',
      to: user.email,
      subject: `Snooze on ${tank.name} ends at ${until}`,
      text,
      html: layout({
        heading: `Snooze on ${tank.name} ends soon`,
        accent: '#11606B',
        body: `<p>${escapeHtml(text)}</p>`,
        footer: 'Extend it in the app if the work is not finished.',
      }),
      organizationId: s.organizationId,
      dedupeKey: `snooze:${s.id}:${new Date(end).toISOString()}`,
    })
    await s.update({ remindedAt: new Date(now) })
    if (id) sent++
  }
  return sent
}
