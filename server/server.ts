import { createServer } from 'node:http'
import type { Config } from './config'
import { createApp } from './app'
import { closeContext, createContext } from './bootstrap'
import type { AppContext } from './context'
import { migrate } from './db/migrate'
import { attachLiveHub } from './live/hub'
import { startEmbeddedBroker, type EmbeddedBroker } from './mqtt/broker'
import { startExternalConsumer } from './mqtt/external'
import { seedDemoIfEmpty } from './seeders/demo'
import { startRetentionJob } from './services/retention'
import { startRuleEngine } from './rules/runtime'
import { createMailNotifier } from './rules/mail-notifier'
import { recordMailAttempts } from './rules/mail-timeline'
import { startMail, type RunningMail } from './mail'
import { startImportRunner } from './imports/runner'

export type RunningServer = {
  ctx: AppContext
  port: number
  mqttPort: number | null
  broker: EmbeddedBroker | null
  rules: ReturnType<typeof startRuleEngine>
  mail: RunningMail
  stop: () => Promise<void>
}

/** Everything one instance runs: migrations, demo seed, HTTP + live hub, MQTT. Tests start it too. */
export async function startServer(config: Config): Promise<RunningServer> {
  const ctx = createContext(config)
  const { logger, sequelize } = ctx
  await sequelize.authenticate()
  const applied = await migrate(sequelize)
  if (applied.length) logger.info({ applied }, 'migrations applied')
  if (config.seedDemo && (await seedDemoIfEmpty(ctx))) logger.info('demo scenario seeded')

  const http = createServer(createApp(ctx))
  const hub = attachLiveHub(ctx, http)
  await new Promise<void>((resolve, reject) => {
    http.once('error', reject)
    http.listen(config.port, config.host, () => resolve())
  })
  const address = http.address()
  const port = typeof address === 'object' && address ? address.port : config.port

  let broker: EmbeddedBroker | null = null
  let external: { close: () => Promise<void> } | null = null
  if (config.mqtt.url) external = await startExternalConsumer(ctx, config.mqtt.url)
  else broker = await startEmbeddedBroker(ctx, { host: config.mqtt.host, port: config.mqtt.port })

  const stopMailTimeline = recordMailAttempts(ctx)
  const mail: RunningMail = await startMail(ctx)
  ctx.alerts.notifier = createMailNotifier(ctx)
  const rules = startRuleEngine(ctx, ctx.alerts.notifier, config.alertTiming, config.rulesTickMs)
  const stopImports = startImportRunner(ctx)
  const stopRetention = startRetentionJob(ctx, { rawRetentionDays: config.rawRetentionDays, everyMs: 3600_000 })

  logger.info({ port, mqttPort: broker?.port ?? null }, 'Tankwarden is listening')

  let stopped = false
  return {
    ctx,
    port,
    mqttPort: broker?.port ?? null,
    broker,
    rules,
    mail,
    async stop() {
      if (stopped) return
      stopped = true
      stopRetention()
      await stopImports()
      await rules.stop()
      await mail.stop()
      stopMailTimeline()
      hub.close()
      await broker?.close()
      await external?.close()
      http.closeAllConnections()
      await new Promise((resolve) => http.close(resolve))
      await closeContext(ctx)
    },
  }
}
