import { EventEmitter } from 'node:events'

export type StoredReading = {
  tankId: number
  metric: string
  time: Date
  value: number
  source: 'device' | 'test_kit' | 'import'
}

/** Everything that happens in-process and that other parts react to. Models import no transport. */
export type EventMap = {
  'readings.stored': [StoredReading[]]
  'device.revoked': [{ deviceId: number }]
  'wall.revoked': [{ credentialId: number }]
  /** Who may see what in an organization changed (a person's sites, role or status; a site or tank archived). */
  'access.changed': [{ organizationId: number }]
  'rules.changed': [{ tankIds: number[] | 'all' }]
  'incident.changed': [{ incidentId: number; tankId: number; siteId: number; state: string }]
  'mail.attempted': [{ outboxId: number; incidentId: number | null; kind: string; to: string; ok: boolean; error?: string }]
}

export type EventBus = {
  on<K extends keyof EventMap>(event: K, listener: (...args: EventMap[K]) => void): void
  off<K extends keyof EventMap>(event: K, listener: (...args: EventMap[K]) => void): void
  emit<K extends keyof EventMap>(event: K, ...args: EventMap[K]): void
}

export function createEventBus(): EventBus {
  const emitter = new EventEmitter()
  emitter.setMaxListeners(100)
  return {
    on: (event, listener) => void emitter.on(event, listener as (...a: unknown[]) => void),
    off: (event, listener) => void emitter.off(event, listener as (...a: unknown[]) => void),
    emit: (event, ...args) => void emitter.emit(event, ...args),
  }
}
