import type { Migration } from '../db/migrate'

const migration: Migration = {
  name: '202612020410-create-care',
  up: async () => {},
  down: async () => {},
}
export default migration
