import { describe, expect, it } from 'vitest'
import { createLimiter, LimiterFullError } from '../../server/platform/limiter'

describe('limiter', () => {
  it('runs at most `running` tasks, queues `waiting` more in order and refuses the rest', async () => {
    const limiter = createLimiter(2, 1)
    const gates: Array<() => void> = []
    const order: number[] = []
    const task = (n: number) => () => new Promise<number>((resolve) => gates.push(() => (order.push(n), resolve(n))))
    const runs = [limiter.run(task(1)), limiter.run(task(2)), limiter.run(task(3))]
    await expect(limiter.run(task(4))).rejects.toBeInstanceOf(LimiterFullError)
    expect(limiter.stats()).toEqual({ active: 2, waiting: 1, peak: 2 })
    gates.shift()!()
    await runs[0]
    await new Promise((r) => setTimeout(r, 0))
    expect(gates).toHaveLength(2) // task 3 started in the freed slot
    while (gates.length) gates.shift()!()
    expect(await Promise.all(runs)).toEqual([1, 2, 3])
    expect(order).toEqual([1, 2, 3])
    expect(limiter.stats()).toEqual({ active: 0, waiting: 0, peak: 2 })
  })

  it('frees the slot of a task that fails', async () => {
    const limiter = createLimiter(1, 0)
    await expect(limiter.run(() => Promise.reject(new Error('boom')))).rejects.toThrow('boom')
    expect(await limiter.run(async () => 'next')).toBe('next')
  })
})
