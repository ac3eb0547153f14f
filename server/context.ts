import type { Sequelize } from 'sequelize'
import type { Config } from './config'
import type { Logger } from './logger'
import type { Models } from './models'

/** What services are built from: passed in, never imported as globals, so tests build their own. */
export type AppContext = {
  config: Config
  sequelize: Sequelize
  models: Models
  logger: Logger
}
