import type { Sequelize } from 'sequelize'
import type { Config } from './config'
import type { EventBus } from './platform/events'
import type { BatchWriter } from './readings/batch-writer'
import type { DeviceStatusTracker } from './readings/device-status'
import type { CorrectionCache } from './readings/corrections'
import type { Ingest } from './readings/ingest'
import type { IncidentNotifier } from './incidents/notifier'
import type { Logger } from './platform/logger'
import type { Models } from './models'

/** What services are built from: passed in, never imported as globals, so tests build their own. */
export type AppContext = {
  config: Config
  sequelize: Sequelize
  models: Models
  logger: Logger
  events: EventBus
  readings: { writer: BatchWriter; status: DeviceStatusTracker; ingest: Ingest; corrections: CorrectionCache }
  /** Who hears about incidents; the mail notifier in a running server, silent in bare tests. */
  incidents: { notifier: IncidentNotifier }
}
