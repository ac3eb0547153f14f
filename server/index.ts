import { createServer } from 'node:http'
import { loadConfig } from './config'
import { createApp } from './app'
import { createContext } from './bootstrap'
import { migrate } from './db/migrate'
import { seedDemoIfEmpty, DEMO_SIGN_INS } from './seeders/demo'

/** The composition root: config → database → migrations → demo → HTTP, with a clean shutdown. */
async function main() {
  const config = loadConfig()
  const ctx = createContext(config)
  const { logger, sequelize } = ctx
  await sequelize.authenticate()
  const applied = await migrate(sequelize)
  if (applied.length) logger.info({ applied }, 'migrations applied')
  if (config.seedDemo && (await seedDemoIfEmpty(ctx))) {
    logger.info('demo scenario seeded')
  }

  const server = createServer(createApp(ctx))
  await new Promise<void>((resolve) => server.listen(config.port, config.host, resolve))
  const address = server.address()
  const port = typeof address === 'object' && address ? address.port : config.port
  logger.info({ port }, 'Tankwarden is listening')
  if (process.send) process.send({ type: 'ready', port, demo: config.seedDemo ? DEMO_SIGN_INS : [] })

  let stopping = false
  const stop = async (signal: string) => {
    if (stopping) return
    stopping = true
    logger.info({ signal }, 'shutting down')
    server.closeAllConnections?.()
    await new Promise((resolve) => server.close(resolve))
    await sequelize.close()
    process.exit(0)
  }
  process.on('SIGINT', () => void stop('SIGINT'))
  process.on('SIGTERM', () => void stop('SIGTERM'))
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error)
  process.exit(1)
})
