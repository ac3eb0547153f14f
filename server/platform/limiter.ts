/** Thrown when a limiter's queue is full: the caller should answer "busy, try again shortly". */
export class LimiterFullError extends Error {}

/**
 * At most `running` tasks at once; up to `waiting` more wait their turn in order, and any beyond
 * that are refused at once with `LimiterFullError` instead of holding their inputs in memory.
 */
export function createLimiter(running: number, waiting: number) {
  let active = 0
  let peak = 0
  const queue: Array<() => void> = []

  async function run<T>(task: () => Promise<T>): Promise<T> {
    if (active >= running) {
      if (queue.length >= waiting) throw new LimiterFullError('too many at once')
      await new Promise<void>((resolve) => queue.push(resolve))
    } else {
      active++
    }
    peak = Math.max(peak, active)
    try {
      return await task()
    } finally {
      const next = queue.shift()
      // The freed slot passes straight to the next in line, so `active` stays as it is.
      if (next) next()
      else active--
    }
  }

  return { run, stats: () => ({ active, waiting: queue.length, peak }) }
}
