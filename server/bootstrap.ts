import type { Config } from './config'
import type { AppContext } from './context'
import { createSequelize } from './db/sequelize'
import { createLogger } from './logger'
import { initModels } from './models'

/** Builds the shared context (database, models, logger) from a config. */
export function createContext(config: Config): AppContext {
  const sequelize = createSequelize(config.databaseUrl)
  const models = initModels(sequelize)
  return { config, sequelize, models, logger: createLogger(config.logLevel) }
}
