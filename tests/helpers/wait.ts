// Waiting in tests: every poll loop goes through these, so a timeout reads the same everywhere.

/** Resolves after `ms` of real time. */
export const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms))

/**
 * Asks `check` every `everyMs` until it answers true or `timeoutMs` have passed, and answers its
 * last answer for the test to assert: `expect(await until(() => rows.length === 3)).toBe(true)`.
 */
export async function until(check: () => boolean | Promise<boolean>, timeoutMs = 20_000, everyMs = 100): Promise<boolean> {
  for (const end = Date.now() + timeoutMs; Date.now() < end;) {
    if (await check()) return true
    await sleep(everyMs)
  }
  return check()
}

/** Probes every `everyMs` until `accept` takes the value, and answers it; after `timeoutMs` throws, naming the last value. */
export async function waitFor<T>(probe: () => Promise<T> | T, accept: (value: T) => boolean, timeoutMs = 10_000, everyMs = 50): Promise<T> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const value = await probe()
    if (accept(value)) return value
    if (Date.now() > deadline) throw new Error(`condition not met within ${timeoutMs} ms: ${String(JSON.stringify(value)).slice(0, 500)}`)
    await sleep(everyMs)
  }
}
