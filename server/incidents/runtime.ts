import type { AppContext } from '../context'
import { incidentsService, type AlertTiming } from './incidents'
import { createRuleEngine } from './engine'
import { LeaderLock, type LeaderJob } from '../platform/leader-lock'
import type { IncidentNotifier } from './notifier'

export const ENGINE_LOCK_KEY = 7_411_002

/**
 * Runs the engine in whichever instance holds the lock, with its timer, and the other
 * single-instance jobs beside it (server/jobs.ts lists them); returns a stop function.
 */
export function startRuleEngine(
  ctx: AppContext,
  notifier: IncidentNotifier,
  timing: AlertTiming,
  tickMs: number,
  options: { whileLeading?: LeaderJob[] } = {},
) {
  const engine = createRuleEngine(ctx, incidentsService(ctx, notifier, timing))
  let timer: NodeJS.Timeout | null = null
  let jobStops: Array<() => void> = []
  const lock = new LeaderLock(ctx.config.databaseUrl, ENGINE_LOCK_KEY, ctx.logger, {
    onAcquire: async () => {
      await engine.start()
      timer = setInterval(() => void engine.tick(), tickMs)
      timer.unref()
      const jobs = options.whileLeading ?? []
      jobStops = jobs.map((job) => job.start())
      ctx.logger.debug({ jobs: jobs.map((job) => job.name) }, 'leader jobs started')
    },
    onLose: async () => {
      for (const stop of jobStops) stop()
      jobStops = []
      if (timer) clearInterval(timer)
      timer = null
      await engine.stop()
    },
  })
  lock.start()
  return {
    engine,
    lock,
    stop: () => lock.stop(),
  }
}
