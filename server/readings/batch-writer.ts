import type { Sequelize, Transaction } from 'sequelize'
import type { Logger } from '../platform/logger'

export type ReadingRow = {
  sourceKey: string
  metric: string
  time: Date
  tankId: number
  value: number
  source: 'device' | 'test_kit' | 'import'
  /** What the device sent, when a calibration corrected it into `value`. */
  rawValue?: number | null
  calibrationId?: number | null
}

type Pending = {
  rows: ReadingRow[]
  /** What the rows hold in memory, as `rowBytes` reckons it. */
  bytes: number
  /** Held requests (MQTT) wait out a database outage; others fail at once so HTTP can answer 503. */
  hold: boolean
  resolve: (inserted: boolean[]) => void
  reject: (error: Error) => void
}

export class DatabaseUnavailableError extends Error {
  constructor(message = 'The database is unavailable') {
    super(message)
  }
}
export class BufferFullError extends Error {}

export type BatchWriterOptions = {
  flushMs?: number
  maxBatchRows?: number
  /** Most rows held in memory while the database is away; past it new held writes are refused. */
  maxBufferedRows?: number
  /** The same by the memory the rows hold (long source keys of imported files make rows larger). */
  maxBufferedBytes?: number
  /** Batches written at once; two keep PostgreSQL busy while the next batch is being gathered. */
  maxConcurrentFlushes?: number
  onStored?: (rows: ReadingRow[]) => void
}

const keyOf = (r: { sourceKey: string; metric: string; time: Date }) => `${r.sourceKey}|${r.metric}|${r.time.getTime()}`
/** A queued row in memory, roughly: the object with its Date and numbers, and its two strings. */
const rowBytes = (r: ReadingRow) => 160 + 2 * (r.sourceKey.length + r.metric.length)

/**
 * Collects readings from every source and writes them in batches: one
 * `INSERT … SELECT FROM unnest(…) ON CONFLICT DO NOTHING RETURNING` per flush, so each caller
 * learns which of its rows were new and which were duplicates.
 */
export class BatchWriter {
  private queue: Pending[] = []
  private queuedRows = 0
  private queuedBytes = 0
  private timer: NodeJS.Timeout | null = null
  private inFlight = 0
  private retryDelayMs = 0
  /** While unhealthy, when the next unheld write may go through as a probe of the database. */
  private probeAt = 0
  healthy = true
  refusedRows = 0
  private readonly flushMs: number
  private readonly maxBatchRows: number
  private readonly maxBufferedRows: number
  private readonly maxBufferedBytes: number
  private readonly maxConcurrentFlushes: number

  constructor(
    private readonly sequelize: Sequelize,
    private readonly logger: Logger,
    private readonly options: BatchWriterOptions = {},
  ) {
    // 20 ms keeps publish-to-screen latency low; under load the two batches in flight still carry thousands of rows each.
    this.flushMs = options.flushMs ?? 20
    this.maxBatchRows = options.maxBatchRows ?? 5000
    this.maxBufferedRows = options.maxBufferedRows ?? 100_000
    // About 20 MB for 100,000 device rows; the count is the limit unless rows are unusually large.
    this.maxBufferedBytes = options.maxBufferedBytes ?? 32 * 1024 * 1024
    this.maxConcurrentFlushes = options.maxConcurrentFlushes ?? 2
  }

  get bufferedRows() {
    return this.queuedRows
  }

  write(rows: ReadingRow[], { hold = false } = {}): Promise<boolean[]> {
    if (!rows.length) return Promise.resolve([])
    // Unheld writes fail fast while the database is away, but one gets through every retry delay:
    // without held writes in the queue nothing else would notice that the database is back.
    if (!hold && !this.healthy) {
      if (Date.now() < this.probeAt) return Promise.reject(new DatabaseUnavailableError())
      this.probeAt = Date.now() + this.retryDelayMs
    }
    let bytes = 0
    for (const r of rows) bytes += rowBytes(r)
    if (this.queuedRows + rows.length > this.maxBufferedRows || this.queuedBytes + bytes > this.maxBufferedBytes) {
      this.refusedRows += rows.length
      this.logger.warn({ refused: rows.length, buffered: this.queuedRows, bufferedBytes: this.queuedBytes }, 'reading buffer full; readings refused')
      return Promise.reject(new BufferFullError('The reading buffer is full'))
    }
    return new Promise((resolve, reject) => {
      this.queue.push({ rows, bytes, hold, resolve, reject })
      this.queuedRows += rows.length
      this.queuedBytes += bytes
      if (this.queuedRows >= this.maxBatchRows) this.schedule(0)
      else this.schedule(this.flushMs)
    })
  }

  private schedule(delay: number) {
    if (this.inFlight >= this.maxConcurrentFlushes) return
    // While the database is away only one batch probes it at a time.
    if (!this.healthy && this.inFlight > 0) return
    if (this.timer && delay > 0) return
    if (this.timer) clearTimeout(this.timer)
    this.timer = setTimeout(() => void this.flush(), Math.max(delay, this.retryDelayMs))
  }

  /** Writes everything queued now and waits for batches in flight (used by shutdown and tests). */
  async drain() {
    for (;;) {
      if (this.timer) clearTimeout(this.timer)
      this.timer = null
      if (this.queue.length && this.inFlight < this.maxConcurrentFlushes) {
        await this.flush()
        if (!this.healthy && this.queue.length) break
      } else if (this.inFlight > 0) {
        await new Promise((r) => setTimeout(r, 5))
      } else if (!this.queue.length) break
    }
  }

  private takeBatch(): Pending[] {
    const batch: Pending[] = []
    let n = 0
    while (this.queue.length && (n === 0 || n + this.queue[0].rows.length <= this.maxBatchRows)) {
      const next = this.queue.shift()!
      n += next.rows.length
      this.queuedBytes -= next.bytes
      batch.push(next)
    }
    this.queuedRows -= n
    return batch
  }

  private async flush() {
    this.timer = null
    if (this.inFlight >= this.maxConcurrentFlushes || !this.queue.length) return
    this.inFlight++
    const batch = this.takeBatch()
    // More waiting: start the next batch now rather than after this one commits.
    if (this.queue.length && this.healthy) this.schedule(this.queuedRows >= this.maxBatchRows ? 0 : this.flushMs)
    try {
      const inserted = await this.insert(batch.flatMap((p) => p.rows))
      this.healthy = true
      this.retryDelayMs = 0
      for (const pending of batch) pending.resolve(pending.rows.map((r) => inserted.delete(keyOf(r))))
    } catch (error) {
      this.healthy = false
      this.retryDelayMs = Math.min(5000, Math.max(250, this.retryDelayMs * 2))
      this.probeAt = Date.now() + this.retryDelayMs
      this.logger.error({ err: error, rows: batch.reduce((n, p) => n + p.rows.length, 0) }, 'writing readings failed')
      // Held writes go back to the front of the queue and wait for the database; the rest fail now.
      const held = batch.filter((p) => p.hold)
      for (const p of batch) if (!p.hold) p.reject(new DatabaseUnavailableError())
      this.queue.unshift(...held)
      for (const p of this.queue.filter((q) => !q.hold)) p.reject(new DatabaseUnavailableError())
      this.queue = this.queue.filter((q) => q.hold)
      this.queuedRows = this.queue.reduce((n, p) => n + p.rows.length, 0)
      this.queuedBytes = this.queue.reduce((n, p) => n + p.bytes, 0)
    } finally {
      this.inFlight--
    }
    if (this.queue.length) this.schedule(this.healthy && this.queuedRows >= this.maxBatchRows ? 0 : this.flushMs)
  }

  private async insert(rows: ReadingRow[]): Promise<Set<string>> {
    const stored = await insertReadings(this.sequelize, rows)
    if (stored.length) this.options.onStored?.(stored)
    return new Set(stored.map(keyOf))
  }
}

/**
 * One statement for any number of rows: `INSERT … SELECT FROM unnest(…) ON CONFLICT DO NOTHING`.
 * Answers the rows that were new (duplicates, also within `rows`, are left out).
 */
export async function insertReadings(sequelize: Sequelize, rows: ReadingRow[], transaction?: Transaction): Promise<ReadingRow[]> {
  if (!rows.length) return []
  const unique = new Map<string, ReadingRow>()
  for (const r of rows) if (!unique.has(keyOf(r))) unique.set(keyOf(r), r)
  const list = [...unique.values()]
  const [result] = (await sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source, raw_value, calibration_id)
     SELECT * FROM unnest($1::text[], $2::text[], $3::timestamptz[], $4::int[], $5::float8[], $6::text[], $7::float8[], $8::int[])
     ON CONFLICT DO NOTHING
     RETURNING source_key, metric, (extract(epoch FROM time) * 1000)::float8 AS ms, tank_id, value, source`,
    {
      bind: [
        list.map((r) => r.sourceKey),
        list.map((r) => r.metric),
        list.map((r) => r.time.toISOString()),
        list.map((r) => r.tankId),
        list.map((r) => r.value),
        list.map((r) => r.source),
        list.map((r) => r.rawValue ?? null),
        list.map((r) => r.calibrationId ?? null),
      ],
      transaction,
    },
  )) as [Array<{ source_key: string; metric: string; ms: number; tank_id: number; value: number; source: ReadingRow['source'] }>, unknown]
  // Epoch milliseconds come back as a plain number, which is much cheaper than parsing timestamps.
  return result.map((r) => ({ sourceKey: r.source_key, metric: r.metric, time: new Date(r.ms), tankId: r.tank_id, value: r.value, source: r.source }))
}
