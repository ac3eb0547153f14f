import { EventEmitter } from 'node:events'
import type { TankKind, TankStage, Targets } from '@shared/schemas/tanks'
import type { MetricKey } from '@shared/metrics/registry'

export type StoredReading = {
  tankId: number
  metric: string
  time: Date
  value: number
  source: 'device' | 'test_kit' | 'import'
}

/** What the features that seed a new tank's defaults need to know of it. */
export type CreatedTank = {
  id: number
  organizationId: number
  siteId: number
  kind: TankKind
  stage: TankStage
  targets: Targets
  heater: { topCm: number } | null
}

/** What a new device's defaults need to know of it. */
export type CreatedDevice = { id: number; organizationId: number; siteId: number; tankId: number; name: string; metrics: MetricKey[]; selfCalibrating: boolean }

/** Everything that happens in-process and that other parts react to. Models import no transport. */
export type EventMap = {
  'readings.stored': [StoredReading[]]
  /** Awaited with `settle`: the tank's starter watch rules and care routine exist when creation answers. */
  'tank.created': [CreatedTank]
  /** Awaited with `settle`: the probe's watch rules exist when creation answers. */
  'device.created': [CreatedDevice]
  'device.revoked': [{ deviceId: number }]
  /** A device's calibrations or its self-calibrating flag changed: ingest reloads its corrections. */
  'calibration.changed': [{ deviceId: number }]
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
  /** Calls every listener and waits for the async ones; the first failure fails the caller. */
  settle<K extends keyof EventMap>(event: K, ...args: EventMap[K]): Promise<void>
}

export function createEventBus(): EventBus {
  const emitter = new EventEmitter()
  emitter.setMaxListeners(100)
  return {
    on: (event, listener) => void emitter.on(event, listener as (...a: unknown[]) => void),
    off: (event, listener) => void emitter.off(event, listener as (...a: unknown[]) => void),
    emit: (event, ...args) => void emitter.emit(event, ...args),
    settle: async (event, ...args) => {
      for (const listener of emitter.listeners(event)) await (listener as (...a: unknown[]) => unknown)(...args)
    },
  }
}
