import type { Migration } from '../db/migrate'

const migration: Migration = {
  name: '202612020330-create-mail-outbox',
  up: async () => {},
  down: async () => {},
}
export default migration
