import { createReadStream } from 'node:fs'
import { createInterface } from 'node:readline'
import { Op } from 'sequelize'
import { UNSTARTED_IMPORT_HOURS } from '@shared/schemas/imports'
import type { AppContext } from '../context'
import type { FileReading } from '../readings'
import type { ImportJob } from '../models'
import { importFiles } from './files'
import { CsvRecordReader, type CsvRecord } from './csv-records'
import { createRejectionReport } from './rejections'
import { createRowReader, reasonOf, type RowProblem } from './row-reader'

/** Readings per call into the ingest path: the batch writer's own batch size, so each call is one INSERT. */
export const IMPORT_BATCH_READINGS = 5000
/** A running job touches its row at least this often; one untouched for STALE_AFTER_MS was interrupted. */
const HEARTBEAT_MS = 10_000
export const STALE_AFTER_MS = 60_000

/** A row waiting for its batch; rows that could not be read wait too, so the report keeps the file's order. */
type Pending = { line: number; raw: string[]; readings: FileReading[]; columns: string[]; problems?: RowProblem[] }

/**
 * Runs import jobs in the background, one at a time per process: the file is streamed line by line
 * (for-await gives backpressure, so memory stays flat whatever the size) into CSV records and sent in
 * batches through the same ingest path as sensor readings.
 */
export function createImportRunner(ctx: AppContext) {
  const { models, logger } = ctx
  const files = importFiles(ctx.config.dataDir)
  const queue: number[] = []
  const cancelled = new Set<number>()
  let current: number | null = null
  let loop: Promise<void> | null = null
  let stopping = false

  async function importFile(job: ImportJob) {
    const mapping = job.mapping!
    const preview = job.preview!
    const tanks = await models.Tank.findAll({ where: { organizationId: job.organizationId, siteId: job.siteId }, attributes: ['id', 'name'] })
    const tanksByName = new Map(tanks.map((t) => [t.name.trim().toLowerCase(), t.id]))
    const readRow = createRowReader(preview.header, mapping, {
      delimiter: preview.delimiter,
      fixedTankId: job.tankId ?? mapping.tankId ?? null,
      tanksByName,
    })
    const report = createRejectionReport(files.report(job.fileKey))
    const counts = { rowsRead: 0, rowsAccepted: 0, rowsDuplicate: 0, rowsRejected: 0, bytesRead: 0 }
    let lastTouch = Date.now()

    async function reject(line: number, raw: string[], problems: RowProblem[]) {
      counts.rowsRejected++
      for (const p of problems) await report.add({ line, raw, delimiter: preview.delimiter, ...p })
    }

    let batch: Pending[] = []
    let batchReadings = 0
    // One batch is written while the next is parsed; results are handled in file order.
    let inFlight: Promise<void> = Promise.resolve()
    async function flush() {
      if (!batch.length) return
      const rows = batch
      batch = []
      batchReadings = 0
      const writing = ctx.readings.ingest.fromFile(rows.flatMap((r) => r.readings))
      writing.catch(() => undefined) // awaited below, in order; this only keeps it from counting as unhandled
      const previous = inFlight
      inFlight = previous.then(async () => settle(rows, await writing))
      await previous
    }

    async function settle(rows: Pending[], outcomes: Awaited<ReturnType<typeof ctx.readings.ingest.fromFile>>) {
      let i = 0
      for (const row of rows) {
        if (row.problems) {
          await reject(row.line, row.raw, row.problems)
          continue
        }
        const mine = outcomes.slice(i, i + row.readings.length)
        i += row.readings.length
        const problems: RowProblem[] = []
        mine.forEach((o, k) => {
          if (o.outcome === 'rejected') {
            const r = row.readings[k]!
            problems.push({ reason: reasonOf(o.reason), detail: o.reason, column: row.columns[k]!, value: String(r.value) })
          }
        })
        if (problems.length) await reject(row.line, row.raw, problems)
        else if (mine.some((o) => o.outcome === 'accepted')) counts.rowsAccepted++
        else {
          counts.rowsDuplicate++
          await report.add({
            line: row.line,
            raw: row.raw,
            delimiter: preview.delimiter,
            reason: 'duplicate',
            detail: 'already stored (same tank, metric and time)',
            column: '',
            value: '',
          })
        }
      }
      await touch()
    }

    async function touch() {
      lastTouch = Date.now()
      const [updated] = await models.ImportJob.update({ ...counts }, { where: { id: job.id, status: 'running' } })
      if (!updated) throw new Interrupted('the job was marked failed while it ran')
    }

    let seenHeader = false
    async function handle(record: CsvRecord) {
      if (!seenHeader) {
        seenHeader = true
        return
      }
      counts.rowsRead++
      if ('error' in record) {
        // Unreadable quoting refuses this one line, once; the next line is read afresh.
        batch.push({
          line: record.line,
          raw: [record.text],
          readings: [],
          columns: [],
          problems: [{ reason: 'invalid', detail: `unreadable CSV: ${record.error}`, column: '', value: '' }],
        })
      } else {
        const row = readRow(record.fields)
        if (!row.ok) batch.push({ line: record.line, raw: record.fields, readings: [], columns: [], problems: row.problems })
        else {
          batch.push({ line: record.line, raw: record.fields, readings: row.readings, columns: row.columns })
          batchReadings += row.readings.length
        }
      }
      if (batchReadings >= IMPORT_BATCH_READINGS || batch.length >= IMPORT_BATCH_READINGS) await flush()
      else if (Date.now() - lastTouch > HEARTBEAT_MS) await touch()
    }

    const input = createReadStream(files.upload(job.fileKey))
    const lines = createInterface({ input, crlfDelay: Infinity })
    const records = new CsvRecordReader(preview.delimiter)
    let lineNumber = 0
    let ended = true
    for await (const text of lines) {
      lineNumber++
      counts.bytesRead = Math.min(job.sizeBytes, counts.bytesRead + Buffer.byteLength(text) + 1)
      for (const record of records.push({ number: lineNumber, text: lineNumber === 1 ? text.replace(/^\uFEFF/, '') : text })) await handle(record)
      if (cancelled.has(job.id) || stopping) {
        ended = false
        break
      }
    }
    if (ended) for (const record of records.end()) await handle(record)
    lines.close()
    input.destroy()
    const wasCancelled = cancelled.has(job.id)
    const wasStopped = stopping && !wasCancelled
    if (!wasCancelled && !wasStopped) await flush()
    await inFlight
    const hasReport = await report.close()
    if (!wasCancelled && !wasStopped) counts.bytesRead = job.sizeBytes
    return { counts, hasReport, outcome: wasCancelled ? ('cancelled' as const) : wasStopped ? ('stopped' as const) : ('done' as const) }
  }

  async function runOne(id: number) {
    const [claimed] = await models.ImportJob.update({ status: 'running', startedAt: new Date() }, { where: { id, status: 'queued' } })
    if (!claimed) return
    const job = (await models.ImportJob.findByPk(id))!
    current = id
    try {
      const { counts, hasReport, outcome } = await importFile(job)
      const status = outcome === 'done' ? 'done' : outcome === 'cancelled' ? 'cancelled' : 'failed'
      const error = outcome === 'stopped' ? 'Stopped by a server shutdown; rows stored so far are kept, start the file again to add the rest' : null
      await models.ImportJob.update({ ...counts, status, hasReport, error, finishedAt: new Date() }, { where: { id, status: 'running' } })
    } catch (error) {
      logger.error({ err: error, importJob: id }, 'import job failed')
      const message = error instanceof Interrupted ? error.message : 'The import stopped on an error; rows stored so far are kept'
      await models.ImportJob.update({ status: 'failed', error: message, finishedAt: new Date() }, { where: { id, status: 'running' } }).catch(() => undefined)
    } finally {
      current = null
      cancelled.delete(id)
      await files.removeUpload(job.fileKey).catch(() => undefined)
    }
  }

  function kick() {
    if (loop || stopping) return
    loop = (async () => {
      while (queue.length && !stopping) await runOne(queue.shift()!)
      loop = null
    })()
  }

  return {
    enqueue(id: number) {
      queue.push(id)
      kick()
    },
    /** A queued job is cancelled at once; a running one stops after its current batch. */
    async cancel(id: number) {
      const index = queue.indexOf(id)
      if (index >= 0) queue.splice(index, 1)
      const [wasQueued] = await models.ImportJob.update(
        { status: 'cancelled', finishedAt: new Date() },
        { where: { id, status: { [Op.in]: ['queued', 'uploaded'] } } },
      )
      if (!wasQueued && current === id) cancelled.add(id)
    },
    /** Jobs left queued or running by an instance that went away are marked failed, never left "running". */
    async markInterrupted(staleAfterMs = STALE_AFTER_MS) {
      const [count] = await models.ImportJob.update(
        {
          status: 'failed',
          error: 'Interrupted by a server restart; rows stored before it are kept, start the file again to add the rest',
          finishedAt: new Date(),
        },
        {
          where: {
            status: { [Op.in]: ['queued', 'running'] },
            updatedAt: { [Op.lt]: new Date(Date.now() - staleAfterMs) },
            ...(current ? { id: { [Op.ne]: current } } : {}),
            ...(queue.length ? { id: { [Op.notIn]: queue } } : {}),
          },
        },
      )
      return count
    },
    /** Uploads never started within UNSTARTED_IMPORT_HOURS: the job row and the file go. Answers how many. */
    async expireUnstarted(now = new Date()) {
      const cutoff = new Date(now.getTime() - UNSTARTED_IMPORT_HOURS * 3600_000)
      // One statement, so a job started at this moment (status no longer 'uploaded') is never deleted.
      const [rows] = (await ctx.sequelize.query(`DELETE FROM import_jobs WHERE status = 'uploaded' AND created_at < $1 RETURNING file_key`, {
        bind: [cutoff],
      })) as [Array<{ file_key: string }>, unknown]
      for (const row of rows) await files.removeUpload(row.file_key).catch(() => undefined)
      return rows.length
    },
    /** Resolves when nothing is queued or running (tests, shutdown). */
    async idle() {
      while (loop) await loop
    },
    async stop() {
      stopping = true
      while (loop) await loop
    },
  }
}

class Interrupted extends Error {}

export type ImportRunner = ReturnType<typeof createImportRunner>

const runners = new WeakMap<AppContext, ImportRunner>()
/** One runner per context, made on first use, so routes and the server share it without widening the context type. */
export function importRunnerFor(ctx: AppContext): ImportRunner {
  let runner = runners.get(ctx)
  if (!runner) runners.set(ctx, (runner = createImportRunner(ctx)))
  return runner
}

/** Marks interrupted jobs and deletes expired uploads at start and every minute after; answers the stop function. */
export function startImportRunner(ctx: AppContext) {
  const runner = importRunnerFor(ctx)
  const sweep = async () => {
    const interrupted = await runner.markInterrupted()
    if (interrupted) ctx.logger.warn({ jobs: interrupted }, 'interrupted import jobs marked failed')
    const expired = await runner.expireUnstarted()
    if (expired) ctx.logger.info({ jobs: expired }, `uploads not started within ${UNSTARTED_IMPORT_HOURS} h deleted`)
  }
  void sweep().catch((error) => ctx.logger.warn({ err: error }, 'import sweep failed'))
  const timer = setInterval(() => void sweep().catch(() => undefined), STALE_AFTER_MS)
  timer.unref()
  return async () => {
    clearInterval(timer)
    await runner.stop()
  }
}
