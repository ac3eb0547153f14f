import type { Migration } from '../db/migrate'

const migration: Migration = {
  name: '202612020350-create-watch-rules-incidents',
  up: async () => {},
  down: async () => {},
}
export default migration
