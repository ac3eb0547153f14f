// Misbehaving nodes: re-sent and shuffled batches, and malformed messages. Pure given the random source.
import type { DeviceReading } from '@shared/ingest/contract'
import { pick, shuffled, type Random } from './random'

/** One message a node puts on the wire: a readings batch, or raw text that may not even be JSON. */
export type OutgoingMessage = { kind: 'readings'; readings: unknown[] } | { kind: 'raw'; body: string }

/** Chance per tick of each misbehaviour. Assumptions chosen so a short run shows every one. */
export const RESEND_CHANCE = 0.3
export const HOLD_BACK_CHANCE = 0.3
export const MALFORMED_CHANCE = 0.5
const HISTORY = 5

export const MALFORMED_KINDS = ['bad_json', 'wrong_version', 'unknown_metric', 'implausible_value', 'unknown_unit', 'time_without_zone'] as const
export type MalformedKind = (typeof MALFORMED_KINDS)[number]

function shiftedTime(time: string, seconds: number): string {
  return new Date(Date.parse(time) + seconds * 1000).toISOString()
}

/** The bad message or reading for one kind, built around a good batch. */
export function malformedMessage(kind: MalformedKind, good: DeviceReading[]): OutgoingMessage {
  const time = shiftedTime(good[0]?.time ?? new Date(0).toISOString(), 1)
  const extra = (reading: Record<string, unknown>): OutgoingMessage => ({
    kind: 'readings',
    readings: [...good, reading],
  })
  switch (kind) {
    case 'bad_json':
      return { kind: 'raw', body: `{"v":1,"readings":[{"metric":"temperature","value":25.1,` }
    case 'wrong_version':
      return { kind: 'raw', body: JSON.stringify({ v: 2, readings: good }) }
    case 'unknown_metric':
      return extra({ metric: 'salinity_guess', value: 12, time })
    case 'implausible_value':
      // Registry plausible range for temperature is −5…60 °C.
      return extra({ metric: 'temperature', value: 150, unit: 'C', time })
    case 'unknown_unit':
      return extra({ metric: 'temperature', value: 299, unit: 'K', time })
    case 'time_without_zone':
      return extra({ metric: 'ph', value: 7, unit: 'pH', time: time.replace(/\.\d+Z$|Z$/, '') })
  }
}

/**
 * Turns each tick's good batch into what a faulty node actually sends. Keeps a short history so
 * it can re-send old batches (duplicates) and hold a batch back behind a newer one (out of order).
 */
export class FaultyOutbox {
  private readonly history: DeviceReading[][] = []
  private heldBack: DeviceReading[] | null = null

  constructor(
    private readonly mode: 'duplicates_and_out_of_order' | 'malformed',
    private readonly random: Random,
  ) {}

  next(good: DeviceReading[]): OutgoingMessage[] {
    return this.mode === 'malformed' ? this.malformed(good) : this.reordered(good)
  }

  private malformed(good: DeviceReading[]): OutgoingMessage[] {
    if (this.random() >= MALFORMED_CHANCE) return [{ kind: 'readings', readings: good }]
    const bad = malformedMessage(pick(this.random, MALFORMED_KINDS), good)
    // A raw message replaces nothing: the good batch still goes out beside it.
    return bad.kind === 'raw' ? [{ kind: 'readings', readings: good }, bad] : [bad]
  }

  private reordered(good: DeviceReading[]): OutgoingMessage[] {
    const out: OutgoingMessage[] = []
    const current = shuffled(this.random, good)
    if (this.heldBack) {
      out.push({ kind: 'readings', readings: current }, { kind: 'readings', readings: this.heldBack })
      this.remember(current)
      this.remember(this.heldBack)
      this.heldBack = null
    } else if (this.random() < HOLD_BACK_CHANCE) {
      this.heldBack = current
    } else {
      out.push({ kind: 'readings', readings: current })
      this.remember(current)
    }
    if (this.history.length > 1 && this.random() < RESEND_CHANCE) {
      const old = pick(this.random, this.history.slice(0, -1))
      out.push({ kind: 'readings', readings: shuffled(this.random, old) })
    }
    return out
  }

  private remember(batch: DeviceReading[]): void {
    this.history.push(batch)
    if (this.history.length > HISTORY) this.history.shift()
  }
}
