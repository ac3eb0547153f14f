import type { QueryInterface } from 'sequelize'

/** One schema step: applied in name order, each once (see ../migrate.ts). */
export type Migration = {
  name: string
  up: (qi: QueryInterface) => Promise<void>
  down: (qi: QueryInterface) => Promise<void>
}
