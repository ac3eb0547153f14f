import pg from 'pg'
import type { Logger } from './logger'

/**
 * Leadership through a PostgreSQL session advisory lock on a connection of its own: exactly one
 * instance holds it; when that instance dies its session ends, the lock is released, and another
 * instance's next attempt takes over.
 */
export class LeaderLock {
  private client: pg.Client | null = null
  private timer: NodeJS.Timeout | null = null
  private leading = false
  private stopped = false

  constructor(
    private readonly databaseUrl: string,
    private readonly key: number,
    private readonly logger: Logger,
    private readonly callbacks: { onAcquire: () => Promise<void> | void; onLose: () => Promise<void> | void },
    private readonly retryMs = 5000,
  ) {}

  get isLeader() {
    return this.leading
  }

  start() {
    void this.attempt()
  }

  private schedule() {
    if (this.stopped) return
    this.timer = setTimeout(() => void this.attempt(), this.retryMs)
    this.timer.unref()
  }

  private async attempt() {
    if (this.stopped || this.leading) return
    try {
      this.client ??= await this.connect()
      const { rows } = await this.client.query<{ ok: boolean }>('SELECT pg_try_advisory_lock($1) AS ok', [this.key])
      if (rows[0].ok) {
        this.leading = true
        this.logger.info({ key: this.key }, 'this instance now runs the watch-rule engine')
        await this.callbacks.onAcquire()
        return
      }
    } catch (error) {
      this.logger.warn({ err: error }, 'leader lock attempt failed')
      await this.drop()
    }
    this.schedule()
  }

  private async connect() {
    const client = new pg.Client({ connectionString: this.databaseUrl })
    client.on('error', () => void this.lost())
    client.on('end', () => void this.lost())
    await client.connect()
    return client
  }

  private async lost() {
    this.client = null
    if (!this.leading) return
    this.leading = false
    this.logger.warn('lost the watch-rule engine lock')
    await this.callbacks.onLose()
    this.schedule()
  }

  private async drop() {
    const c = this.client
    this.client = null
    await c?.end().catch(() => {})
  }

  async stop() {
    this.stopped = true
    if (this.timer) clearTimeout(this.timer)
    const wasLeading = this.leading
    this.leading = false
    if (wasLeading) await this.callbacks.onLose()
    await this.drop()
  }
}

/** A job that must run in one instance only: started on taking the lock, its stop function called on losing it. */
export interface LeaderJob {
  /** What it does, in a few words: the list in server/jobs.ts reads by these, and the log names them. */
  name: string
  start: () => () => void
}
