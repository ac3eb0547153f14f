import { loadConfig } from './config'
import { DEMO_SIGN_INS } from './demo/demo'
import { startServer } from './server'

/** The process entry point: config from the environment, start, report readiness, stop on a signal. */
async function main() {
  const config = loadConfig()
  const running = await startServer(config)
  if (process.send) {
    process.send({ type: 'ready', port: running.port, mqttPort: running.mqttPort, demo: config.seedDemo ? DEMO_SIGN_INS : [], setupCode: running.setupCode })
  }
  let stopping = false
  const stop = async (signal: string) => {
    if (stopping) return
    stopping = true
    running.ctx.logger.info({ signal }, 'shutting down')
    await running.stop()
    process.exit(0)
  }
  process.on('SIGINT', () => void stop('SIGINT'))
  process.on('SIGTERM', () => void stop('SIGTERM'))
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error)
  process.exit(1)
})
