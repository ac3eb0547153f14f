import { readingsMessageSchema, MAX_READINGS_PER_MESSAGE, type IngestSummary, type ReadingOutcome } from '@shared/ingest/contract'
import type { DeviceActor } from '../access/actor'
import type { BatchWriter, ReadingRow } from './batch-writer'
import type { CorrectionCache } from './corrections'
import type { DeviceStatusTracker } from './device-status'
import { checkReading, type ReadingLimits } from './validate-readings'

/** The message cannot be read at all (not JSON, wrong envelope): nothing in it was stored. */
export class MalformedMessageError extends Error {
  /** The part of the message at fault (`body`, `v`, `readings`), for the 400's `fields`. */
  constructor(
    message: string,
    readonly field = 'body',
    readonly problem = message,
  ) {
    super(message)
  }
}

export type IngestDeps = {
  writer: BatchWriter
  status: DeviceStatusTracker
  limits: ReadingLimits
  corrections: CorrectionCache
}

function parseEnvelope(body: unknown) {
  const parsed = readingsMessageSchema.safeParse(body)
  if (parsed.success) return parsed.data.readings
  const issue = parsed.error.issues[0]
  const where = issue.path.join('.') || 'body'
  if (issue.path[0] === 'readings' && issue.code === 'too_big') {
    return new MalformedMessageError(
      `readings: at most ${MAX_READINGS_PER_MESSAGE} readings per message`,
      'readings',
      `at most ${MAX_READINGS_PER_MESSAGE} readings per message`,
    )
  }
  return new MalformedMessageError(`${where}: ${issue.message} (expected {"v":1,"readings":[…]})`, where, issue.message)
}

/**
 * One path for every device reading, whatever the transport: validate, convert to canonical
 * units, check plausibility and clock, dedupe, write in batches, and answer per reading.
 */
export function createIngest(deps: IngestDeps) {
  const { writer, status, limits, corrections } = deps

  async function fromDevice(device: DeviceActor, body: unknown, options: { hold: boolean }): Promise<IngestSummary> {
    const readings = parseEnvelope(body)
    if (readings instanceof MalformedMessageError) {
      status.rejected(device.deviceId, 1, readings.message)
      throw readings
    }
    const now = Date.now()
    const results: ReadingOutcome[] = []
    const rows: ReadingRow[] = []
    const rowIndex: number[] = []
    // Cached per device: a calibration is applied here, before the batch write, never by a query per reading.
    const calibrations = readings.length ? await corrections.of(device.deviceId) : undefined
    readings.forEach((raw, index) => {
      const checked = checkReading(raw, limits, now)
      if (!checked.ok) {
        results[index] = { index, outcome: 'rejected', reason: checked.reason, field: `readings.${index}.${checked.field}` }
        return
      }
      const correction = calibrations?.get(checked.metric)
      rows.push({
        sourceKey: `d:${device.deviceId}`,
        metric: checked.metric,
        time: checked.time,
        tankId: device.tankId,
        value: correction ? correction.intercept + correction.gain * checked.value : checked.value,
        source: 'device',
        rawValue: correction ? checked.value : null,
        calibrationId: correction ? correction.calibrationId : null,
      })
      rowIndex.push(index)
    })
    const inserted = await writer.write(rows, { hold: options.hold })
    inserted.forEach((isNew, i) => {
      const index = rowIndex[i]
      results[index] = { index, outcome: isNew ? 'accepted' : 'duplicate' }
    })
    const summary = tally(results)
    status.seen(device.deviceId)
    if (summary.rejected) {
      const firstReason = results.find((r) => r.outcome === 'rejected') as { reason: string }
      status.rejected(device.deviceId, summary.rejected, firstReason.reason)
    }
    return summary
  }

  /**
   * Readings read from an uploaded file: the same checks, conversion and writer as a device's,
   * one outcome per reading in order, without the device bookkeeping.
   */
  async function fromFile(readings: FileReading[]): Promise<ReadingOutcome[]> {
    const now = Date.now()
    const results: ReadingOutcome[] = new Array(readings.length)
    const rows: ReadingRow[] = []
    const rowIndex: number[] = []
    readings.forEach((r, index) => {
      const checked = checkReading({ metric: r.metric, value: r.value, unit: r.unit, time: r.time.toISOString() }, limits, now)
      if (!checked.ok) {
        results[index] = { index, outcome: 'rejected', reason: checked.reason }
        return
      }
      rows.push({ sourceKey: r.sourceKey, metric: checked.metric, time: checked.time, tankId: r.tankId, value: checked.value, source: 'import' })
      rowIndex.push(index)
    })
    const inserted = await writer.write(rows)
    inserted.forEach((isNew, i) => {
      const index = rowIndex[i]!
      results[index] = { index, outcome: isNew ? 'accepted' : 'duplicate' }
    })
    return results
  }

  return { fromDevice, fromFile }
}

export type FileReading = { sourceKey: string; tankId: number; metric: string; value: number; unit: string; time: Date }

function tally(results: ReadingOutcome[]): IngestSummary {
  let accepted = 0
  let duplicates = 0
  let rejected = 0
  for (const r of results) {
    if (r.outcome === 'accepted') accepted++
    else if (r.outcome === 'duplicate') duplicates++
    else rejected++
  }
  return { accepted, duplicates, rejected, results }
}

export type Ingest = ReturnType<typeof createIngest>
