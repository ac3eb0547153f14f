import type { AppContext } from '../context'
import { incidentsService, type AlertTiming } from '../services/incidents'
import { createRuleEngine } from './engine'
import { LeaderLock } from './leader-lock'
import type { IncidentNotifier } from './notifier'

export const ENGINE_LOCK_KEY = 7_411_002

/** Runs the engine in whichever instance holds the lock, with its timer; returns a stop function. */
export function startRuleEngine(ctx: AppContext, notifier: IncidentNotifier, timing: AlertTiming, tickMs: number) {
  const engine = createRuleEngine(ctx, incidentsService(ctx, notifier, timing))
  let timer: NodeJS.Timeout | null = null
  const lock = new LeaderLock(ctx.config.databaseUrl, ENGINE_LOCK_KEY, ctx.logger, {
    onAcquire: async () => {
      await engine.start()
      timer = setInterval(() => void engine.tick(), tickMs)
      timer.unref()
    },
    onLose: async () => {
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
