import type { AppContext } from './context'
import type { LeaderJob } from './platform/leader-lock'
import { startRetentionJob } from './readings/retention'
import { startReportJob } from './reports/job'
import { startCareDigestJob } from './care/digest'

/**
 * The jobs that run beside the watch-rule engine, in the one instance holding the leader lock
 * (server/platform/leader-lock.ts, run by server/incidents/runtime.ts): each starts when the
 * instance takes the lock and stops when it loses it. The features own the job functions; this is
 * the one list of them. Retention must not run twice at once; the report and digest jobs would be
 * safe twice over (their outbox dedupe keys), but once is less work. Jobs every instance runs for
 * itself (the import runner: an upload is on its own disk) are started in server/server.ts.
 */
export function leaderJobs(ctx: AppContext): LeaderJob[] {
  const { config } = ctx
  return [
    {
      name: 'readings roll-up and retention',
      start: () => startRetentionJob(ctx, { rawRetentionDays: config.rawRetentionDays, everyMs: 3600_000 }),
    },
    { name: 'scheduled reports', start: () => startReportJob(ctx, { everyMs: config.reportScheduleTickMs }) },
    { name: 'morning care digest', start: () => startCareDigestJob(ctx) },
  ]
}
