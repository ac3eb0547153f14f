import type { Migration } from '../db/migrate'

const migration: Migration = {
  name: '202612020400-create-wall-credentials',
  up: async () => {},
  down: async () => {},
}
export default migration
