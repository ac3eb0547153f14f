// Entry point: `npm run simulate` — a shop full of sensor nodes speaking the public device contract.
import { createApiClient, waitForApi } from './api-client'
import { buildNodes } from './nodes'
import { parseOptions, USAGE } from './options'
import { provisionDevices } from './provision'
import { runLoop } from './runner'

const log = (line: string) => console.log(`[simulator] ${line}`)

async function main(): Promise<number> {
  const parsed = parseOptions(process.argv.slice(2), process.env)
  if (parsed === 'help') {
    console.log(USAGE)
    return 0
  }
  const options = parsed
  const stop = new AbortController()
  let looping = false
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.on(signal, () => {
      // Before the loop nothing is open that needs closing; a second signal means "now".
      if (!looping || stop.signal.aborted) {
        log(`${signal}: exiting`)
        process.exit(0)
      }
      log(`${signal}: stopping`)
      stop.abort()
    })
  }

  const api = createApiClient(options.url)
  log(`waiting for ${options.url}`)
  await waitForApi(api, log)
  const tanks = await provisionDevices(api, {
    email: options.email,
    password: options.password,
    intervalSeconds: Math.max(1, Math.round(options.intervalS)),
    tankLimit: options.tanks ?? undefined,
    log,
  })
  for (const name of options.scenarios.keys()) {
    if (!tanks.some((t) => t.spec.name === name)) log(`scenario for unknown tank '${name}' ignored`)
  }
  const nodes = await buildNodes(options, tanks, log)
  log(`${nodes.length} nodes over ${options.transport}, every ${options.intervalS} s, speed ×${options.speed}`)
  if (stop.signal.aborted || nodes.length === 0) return nodes.length === 0 && tanks.length > 0 ? 1 : 0

  looping = true
  try {
    await runLoop(nodes, { ...options, log, signal: stop.signal })
  } finally {
    await Promise.allSettled(nodes.map((node) => node.transport.close()))
    log('stopped')
  }
  return 0
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`[simulator] ${(err as Error).message}`)
    process.exit(1)
  },
)
