import type { Sequelize } from 'sequelize'
import type { Logger } from '../platform/logger'

type Status = { lastSeenAt?: Date; rejected: number; lastError?: string; lastErrorAt?: Date }

/**
 * Device last-seen and last-error, coalesced in memory and written every few seconds in one
 * statement, so a busy ingest path does not issue one UPDATE per message.
 */
export class DeviceStatusTracker {
  private pending = new Map<number, Status>()
  private timer: NodeJS.Timeout

  constructor(
    private readonly sequelize: Sequelize,
    private readonly logger: Logger,
    everyMs = 2000,
  ) {
    this.timer = setInterval(() => void this.flush(), everyMs)
    this.timer.unref()
  }

  private entry(deviceId: number) {
    let s = this.pending.get(deviceId)
    if (!s) this.pending.set(deviceId, (s = { rejected: 0 }))
    return s
  }

  seen(deviceId: number, at = new Date()) {
    this.entry(deviceId).lastSeenAt = at
  }

  rejected(deviceId: number, count: number, reason: string, at = new Date()) {
    const s = this.entry(deviceId)
    s.rejected += count
    s.lastError = reason.slice(0, 500)
    s.lastErrorAt = at
  }

  async flush() {
    if (!this.pending.size) return
    const entries = [...this.pending.entries()]
    this.pending = new Map()
    try {
      await this.sequelize.query(
        `UPDATE devices d SET
           last_seen_at = GREATEST(d.last_seen_at, u.seen),
           rejected_count = d.rejected_count + u.rejected,
           last_error = COALESCE(u.error, d.last_error),
           last_error_at = COALESCE(u.error_at, d.last_error_at)
         FROM unnest($1::int[], $2::timestamptz[], $3::int[], $4::text[], $5::timestamptz[])
           AS u(id, seen, rejected, error, error_at)
         WHERE d.id = u.id`,
        {
          bind: [
            entries.map(([id]) => id),
            entries.map(([, s]) => s.lastSeenAt?.toISOString() ?? null),
            entries.map(([, s]) => s.rejected),
            entries.map(([, s]) => s.lastError ?? null),
            entries.map(([, s]) => s.lastErrorAt?.toISOString() ?? null),
          ],
        },
      )
    } catch (error) {
      // Status is advisory: keep the counts for the next attempt rather than lose them.
      for (const [id, s] of entries) {
        const now = this.entry(id)
        now.rejected += s.rejected
        now.lastSeenAt ??= s.lastSeenAt
        now.lastError ??= s.lastError
        now.lastErrorAt ??= s.lastErrorAt
      }
      this.logger.warn({ err: error }, 'device status update failed; will retry')
    }
  }

  stop() {
    clearInterval(this.timer)
  }
}
