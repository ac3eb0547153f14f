import { openDB, type DBSchema, type IDBPDatabase } from 'idb'

/** What a phone keeps for working without a connection: answers it was given, and entries not yet sent. */
export type OutboxKind = 'test-kit' | 'care-log' | 'task-done'

export interface OutboxItem {
  clientId: string
  /** Sending order: the order the keeper made them in. */
  seq: number
  userId: number
  kind: OutboxKind
  tankId: number
  url: string
  body: Record<string, unknown>
  /** Words for the list: "Test-kit entry: pH 7.2, nitrate 20 mg/L". */
  label: string
  madeAt: string
  state: 'waiting' | 'refused'
  reason?: string
  fields?: Record<string, string>
}

export interface SavedRead {
  key: string
  userId: number
  savedAt: number
  data: unknown
}

interface OfflineSchema extends DBSchema {
  outbox: { key: string; value: OutboxItem; indexes: { byUser: number } }
  reads: { key: string; value: SavedRead; indexes: { byUser: number } }
}

let opening: Promise<IDBPDatabase<OfflineSchema> | null> | null = null

/** The phone's database, or null where the browser has none (or refuses it, as some private modes do). */
export function offlineDb(): Promise<IDBPDatabase<OfflineSchema> | null> {
  if (typeof indexedDB === 'undefined') return Promise.resolve(null)
  opening ??= openDB<OfflineSchema>('tankwarden-offline', 1, {
    upgrade(db) {
      db.createObjectStore('outbox', { keyPath: 'clientId' }).createIndex('byUser', 'userId')
      db.createObjectStore('reads', { keyPath: 'key' }).createIndex('byUser', 'userId')
    },
  }).catch(() => null)
  return opening
}

let ownerSource: () => number | null = () => null

/** The signed-in person: saved answers and waiting entries are theirs alone on a shared phone. */
export function provideOfflineOwner(source: () => number | null) {
  ownerSource = source
}

export const offlineOwner = () => ownerSource()
