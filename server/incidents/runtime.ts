import type { AppContext } from '../context'
import { incidentsService, type AlertTiming } from './incidents'
import { createRuleEngine } from './engine'
import { LeaderLock } from '../platform/leader-lock'
import type { IncidentNotifier } from './notifier'

export const ENGINE_LOCK_KEY = 7_411_002

/** A job that must run in one instance only; started on taking the lock, its stop function called on losing it. */
export type LeaderJob = () => () => void

/**
 * Runs the engine in whichever instance holds the lock, with its timer, and the other
 * single-instance jobs beside it; returns a stop function.
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
      jobStops = (options.whileLeading ?? []).map((start) => start())
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
