import type { Migration } from '../db/migrate'

const migration: Migration = {
  name: '202612020340-create-duty-roster',
  up: async () => {},
  down: async () => {},
}
export default migration
