import { createServer } from 'node:http'
import type { Config } from './config'
import { createApp } from './app'
import { closeContext, createContext } from './bootstrap'
import { startClusterFanout, type ClusterFanout } from './platform/cluster/fanout'
import type { AppContext } from './context'
import { migrate } from './platform/db/migrate'
import { attachLiveHub } from './live/hub'
import { startEmbeddedBroker, type EmbeddedBroker } from './mqtt/broker'
import { startExternalConsumer, type ExternalConsumer } from './mqtt/external'
import { seedDemoIfEmpty } from './demo/demo'
import { startRuleEngine } from './incidents/runtime'
import { leaderJobs } from './jobs'
import { createMailNotifier } from './incidents/mail-notifier'
import { recordMailAttempts } from './incidents/mail-timeline'
import { startMail, type RunningMail } from './mail'
import { startPush, type PushSender } from './push'
import { startImportRunner } from './imports/runner'
import { setupCodeFor, setupService } from './setup/setup'

export type RunningServer = {
  ctx: AppContext
  port: number
  mqttPort: number | null
  broker: EmbeddedBroker | null
  /** The consumer of an external broker (MQTT_URL mode), else null. */
  external: ExternalConsumer | null
  fanout: ClusterFanout
  rules: ReturnType<typeof startRuleEngine>
  mail: RunningMail
  /** The push outbox's sender (phone notifications). */
  push: PushSender
  hub: ReturnType<typeof attachLiveHub>
  /** On an installation without any organisation: the code that lets another machine run the setup page. */
  setupCode: string | null
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

  // Before anything can emit: events of this instance reach the others, theirs reach this one.
  const fanout = await startClusterFanout(ctx)
  const http = createServer(createApp(ctx))
  const hub = attachLiveHub(ctx, http)
  await new Promise<void>((resolve, reject) => {
    http.once('error', reject)
    http.listen(config.port, config.host, () => resolve())
  })
  const address = http.address()
  const port = typeof address === 'object' && address ? address.port : config.port

  let broker: EmbeddedBroker | null = null
  let external: ExternalConsumer | null = null
  if (config.mqtt.url) external = await startExternalConsumer(ctx, config.mqtt.url)
  else broker = await startEmbeddedBroker(ctx, { host: config.mqtt.host, port: config.mqtt.port })

  const stopMailTimeline = recordMailAttempts(ctx)
  const mail: RunningMail = await startMail(ctx)
  const push = startPush(ctx)
  ctx.incidents.notifier = createMailNotifier(ctx)
  // Jobs that must not run twice go beside the engine, in the one instance holding the lock.
  const rules = startRuleEngine(ctx, ctx.incidents.notifier, config.incidentTiming, config.rulesTickMs, { whileLeading: leaderJobs(ctx) })
  // Each instance runs the imports uploaded to it: the uploaded file is on its own disk.
  const stopImports = startImportRunner(ctx)

  logger.info({ port, mqttPort: broker?.port ?? null }, 'Tankwarden is listening')
  const setupCode = (await setupService(ctx).isNeeded()) ? setupCodeFor(ctx) : null
  if (setupCode) logger.info({ setupPath: '/setup', setupCode }, 'no business set up yet: open /setup (from another machine, with this setup code)')

  let stopped = false
  return {
    ctx,
    port,
    mqttPort: broker?.port ?? null,
    broker,
    external,
    fanout,
    rules,
    mail,
    push,
    hub,
    setupCode,
    async stop() {
      if (stopped) return
      stopped = true
      await stopImports()
      await rules.stop()
      await mail.stop()
      await push.stop()
      stopMailTimeline()
      hub.close()
      await broker?.close()
      await external?.close()
      await fanout.stop()
      http.closeAllConnections()
      await new Promise((resolve) => http.close(resolve))
      await closeContext(ctx)
    },
  }
}
