import type { AppContext } from '../context'
import { nextReportSend } from '@shared/report/period'
import { sendScheduledReport } from './schedules'

/**
 * One pass: every enabled schedule whose last ended period has reached its send time (08:00 site
 * time on the day after) and has not been sent gets it sent. Answers the mails queued.
 */
export async function runReportSchedules(ctx: AppContext, now = new Date()): Promise<number> {
  const schedules = await ctx.models.ReportSchedule.findAll({ where: { enabled: true }, order: [['id', 'ASC']] })
  let queued = 0
  for (const schedule of schedules) {
    try {
      const tank = schedule.tankId !== null ? await ctx.models.Tank.findByPk(schedule.tankId, { attributes: ['siteId'] }) : null
      const site = await ctx.models.Site.findByPk(schedule.siteId ?? tank?.siteId ?? 0, { attributes: ['id', 'timeZone'] })
      if (!site) continue
      // The same rule the Reports screen shows as "Next report …".
      const next = nextReportSend(schedule.period, schedule.lastSentPeriod, now.getTime(), site.timeZone)
      if (next.at > now.getTime()) continue
      queued += await sendScheduledReport(ctx, schedule, next.period, { claim: true, dedupeSuffix: 'scheduled', now })
    } catch (error) {
      // One broken schedule must not hold up the others; it is tried again next pass.
      ctx.logger.error({ err: error, scheduleId: schedule.id }, 'scheduled report failed')
    }
  }
  return queued
}

/** Runs a pass every `everyMs` (default a minute); answers a stop function. */
export function startReportJob(ctx: AppContext, options: { everyMs?: number } = {}): () => void {
  let running = false
  const timer = setInterval(async () => {
    if (running) return
    running = true
    try {
      await runReportSchedules(ctx)
    } catch (error) {
      ctx.logger.error({ err: error }, 'report schedule pass failed')
    } finally {
      running = false
    }
  }, options.everyMs ?? 60_000)
  timer.unref()
  return () => clearInterval(timer)
}
