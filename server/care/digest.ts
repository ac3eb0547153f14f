import { QueryTypes } from 'sequelize'
import { byUrgency } from '@shared/care/due'
import { formatDayTime } from '@shared/time'
import { formatLocalDate, localDateAt, offsetAt } from '@shared/time/zoned'
import type { AppContext } from '../context'
import { careDigest, type DigestTank, type DigestTask } from '../mail'
import { enqueueMail } from '../mail'
import { dueItems } from './care-tasks'
import { dutyRecipients } from '../roster'
import { clockStyleOf } from '../people'
import { tanksToWatch } from './tanks-to-watch'
import { consumableAlerts } from '../equipment'

/** The digest goes out from the configured hour until this many hours later (a late start still sends it). */
export const DIGEST_WINDOW_HOURS = 3
/** Serialises the once-a-day check of one site across instances (pg_advisory_xact_lock(key, siteId)). */
const DIGEST_LOCK_KEY = 7_411_006

export type DigestOptions = { hour: number }
export type DigestRun = {
  site: { id: number; name: string }
  day: string
  outcome: 'sent' | 'nothing_due' | 'already_sent' | 'nobody_on_duty'
  recipients: string[]
}

/** The hour (0–23) on the site's clock at `atMs`. */
export function localHourAt(timeZone: string, atMs: number): number {
  return new Date(atMs + offsetAt(timeZone, atMs)).getUTCHours()
}

/** True while `atMs` falls in the digest window of the site's own day. */
export function inDigestWindow(timeZone: string, atMs: number, hour: number): boolean {
  const local = localHourAt(timeZone, atMs)
  return local >= hour && local < hour + DIGEST_WINDOW_HOURS
}

/** The dedupe-key prefix naming one site's digest of one local day; each recipient's key extends it. */
export const digestKeyPrefix = (siteId: number, day: string) => `care_digest:site:${siteId}:${day}:`

function dayLabel(timeZone: string, atMs: number) {
  return new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }).format(atMs).replace(',', '')
}

/**
 * Mails each site's care digest to the people on duty, once per site per local day: the first run
 * inside the site's window decides who gets it and enqueues all of it in one transaction; a lock
 * per site and the outbox dedupe keys make a second run (a restart, another instance) a no-op.
 * Sites with no task overdue, due today or due soon and no supply to reorder get nothing.
 */
export async function sendCareDigests(ctx: AppContext, options: DigestOptions, now = new Date()): Promise<DigestRun[]> {
  const sites = await ctx.models.Site.findAll({ where: { archivedAt: null }, order: [['id', 'ASC']] })
  const runs: DigestRun[] = []
  for (const site of sites) {
    const zone = site.timeZone
    if (!inDigestWindow(zone, now.getTime(), options.hour)) continue
    const day = formatLocalDate(localDateAt(zone, now.getTime()))
    const run = (outcome: DigestRun['outcome'], recipients: string[] = []) => runs.push({ site: { id: site.id, name: site.name }, day, outcome, recipients })

    const items = (await dueItems(ctx, { siteIds: [site.id] }, now)).filter((i) => !i.due.snoozed && i.due.status !== 'later')
    const supplies = await consumableAlerts(ctx, [site.id], now)
    if (!items.length && !supplies.length) {
      run('nothing_due')
      continue
    }
    items.sort((a, b) => a.tank.name.localeCompare(b.tank.name) || a.tank.id - b.tank.id || byUrgency(a.due, b.due) || a.task.id - b.task.id)
    const tanks: DigestTank[] = []
    for (const { task, tank, due } of items) {
      let entry = tanks.at(-1)
      const url = `${ctx.config.publicUrl}/tanks/${tank.id}`
      if (!entry || entry.url !== url) tanks.push((entry = { name: tank.name, url, tasks: [] }))
      entry.tasks.push({ title: task.title, status: due.status as DigestTask['status'], dueOn: due.dueOn, daysUntilDue: due.daysUntilDue })
    }
    const clockStyle = await clockStyleOf(ctx, site.organizationId)
    const watch = (await tanksToWatch(ctx, [site.id], now)).map((w) => ({
      name: w.tank.name,
      url: `${ctx.config.publicUrl}/tanks/${w.tank.id}`,
      quarantine: w.quarantine,
      watchUntilText: w.watchUntil ? formatDayTime(w.watchUntil, zone, clockStyle) : null,
    }))
    const mail = careDigest({
      siteName: site.name,
      dayLabel: dayLabel(zone, now.getTime()),
      tanks,
      watch,
      supplies,
      suppliesUrl: `${ctx.config.publicUrl}/supplies?site=${site.id}`,
      careTodayUrl: `${ctx.config.publicUrl}/care/today`,
    })

    const prefix = digestKeyPrefix(site.id, day)
    const outcome = await ctx.sequelize.transaction(async (transaction) => {
      await ctx.sequelize.query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [DIGEST_LOCK_KEY, site.id], transaction })
      const sent = await ctx.sequelize.query<{ n: number }>(
        `SELECT count(*)::int AS n FROM mail_outbox WHERE kind = 'care_digest' AND starts_with(dedupe_key, $1)`,
        { bind: [prefix], type: QueryTypes.SELECT, transaction },
      )
      if (sent[0]!.n > 0) return { outcome: 'already_sent' as const, to: [] }
      const recipients = await dutyRecipients(ctx, site.id, now)
      if (!recipients.length) return { outcome: 'nobody_on_duty' as const, to: [] }
      for (const person of recipients) {
        await enqueueMail(
          ctx,
          {
            kind: 'care_digest',
            to: person.email,
            ...mail,
            organizationId: site.organizationId,
            dedupeKey: `${prefix}user:${person.userId}`,
          },
          { transaction },
        )
      }
      return { outcome: 'sent' as const, to: recipients.map((p) => p.email) }
    })
    run(outcome.outcome, outcome.to)
  }
  return runs
}

/** Checks every `everyMs` (a minute by default) whether a site's digest is due; never keeps the process alive. */
export function startCareDigestJob(ctx: AppContext, options: DigestOptions & { everyMs?: number } = { hour: ctx.config.careDigestHour }) {
  let running = false
  const tick = async () => {
    if (running) return
    running = true
    try {
      for (const r of await sendCareDigests(ctx, options)) {
        if (r.outcome === 'sent') ctx.logger.info({ siteId: r.site.id, day: r.day, recipients: r.recipients.length }, 'care digest enqueued')
      }
    } catch (error) {
      ctx.logger.error({ err: error }, 'care digest failed')
    } finally {
      running = false
    }
  }
  const timer = setInterval(() => void tick(), options.everyMs ?? 60_000)
  timer.unref()
  return () => clearInterval(timer)
}
