import type { Migration } from '../db/migrate'
import createFoundation from './202612020200-create-foundation'
import createReadings from './202612020230-create-readings'

/** Every migration in order. Add new files here; never edit one that has shipped. */
export const migrations: Migration[] = [createFoundation, createReadings]
