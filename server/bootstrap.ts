import type { Config } from './config'
import type { AppContext } from './context'
import { createSequelize } from './platform/db/sequelize'
import { createEventBus } from './platform/events'
import { BatchWriter, type BatchWriterOptions } from './readings/batch-writer'
import { DeviceStatusTracker } from './readings/device-status'
import { createIngest } from './readings/ingest'
import { CorrectionCache } from './readings/corrections'
import { currentCorrections } from './calibration'
import { createLogger } from './platform/logger'
import { initModels } from './models'
import { silentNotifier } from './incidents/notifier'
import { rulesService } from './incidents/watch-rules'
import { createDefaultCareTasks, createProbeCareTasks } from './care/care-tasks'

/** Builds the shared context (database, models, logger, events, ingest) from a config. */
export function createContext(config: Config, options: { writer?: BatchWriterOptions } = {}): AppContext {
  const sequelize = createSequelize(config.databaseUrl)
  const models = initModels(sequelize)
  const logger = createLogger(config.logLevel, { format: config.logFormat })
  const events = createEventBus()
  const writer = new BatchWriter(sequelize, logger, {
    ...options.writer,
    onStored: (rows) => events.emit('readings.stored', rows),
  })
  const status = new DeviceStatusTracker(sequelize, logger)
  const corrections = new CorrectionCache((deviceId) => currentCorrections(sequelize, deviceId))
  const ingest = createIngest({ writer, status, limits: config.readingLimits, corrections })
  const ctx: AppContext = {
    config,
    sequelize,
    models,
    logger,
    events,
    readings: { writer, status, ingest, corrections },
    incidents: { notifier: silentNotifier },
  }
  events.on('calibration.changed', ({ deviceId }) => corrections.forget(deviceId))
  // A new tank gets its starter watch rules, then its care routine, before its creation answers.
  events.on('tank.created', (tank) => rulesService(ctx).createDefaults(tank))
  events.on('tank.created', (tank) => createDefaultCareTasks(ctx, tank))
  // A new probe brings its watch rules (it disagrees with the test kit, it stands still).
  events.on('device.created', (device) => rulesService(ctx).createProbeDefaults(device))
  events.on('device.created', (device) => createProbeCareTasks(ctx, device))
  return ctx
}

/** Writes what is still buffered and closes the database. */
export async function closeContext(ctx: AppContext) {
  await ctx.readings.writer.drain()
  ctx.readings.status.stop()
  await ctx.readings.status.flush()
  await ctx.sequelize.close()
}
