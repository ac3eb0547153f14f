import { describe, expect, it } from 'vitest'
import { deviceReadingSchema, readingsMessageSchema, type DeviceReading } from '@shared/ingest/contract'
import { isMetricKey, METRICS } from '@shared/metrics'
import { FaultyOutbox, MALFORMED_KINDS, malformedMessage, type OutgoingMessage } from '../../../simulator/model/faults'
import { mulberry32 } from '../../../simulator/model/random'

const batch = (n: number): DeviceReading[] => {
  const time = new Date(Date.UTC(2024, 0, 15, 12, 0, n * 10)).toISOString()
  return [
    { metric: 'temperature', value: 25 + n / 100, unit: 'C', time },
    { metric: 'ph', value: 7.1, unit: 'pH', time },
    { metric: 'light', value: 4000, unit: 'lux', time },
    { metric: 'water_level', value: 36, unit: 'cm', time },
  ]
}

/** True when the registry and contract would accept the reading. */
function acceptable(reading: unknown): boolean {
  const parsed = deviceReadingSchema.safeParse(reading)
  if (!parsed.success || !isMetricKey(parsed.data.metric)) return false
  const def = METRICS[parsed.data.metric]
  const unit = parsed.data.unit ?? def.unit
  return unit in def.units && (unit !== def.unit || (parsed.data.value >= def.plausible.min && parsed.data.value <= def.plausible.max))
}

function messageIsAcceptable(message: OutgoingMessage): boolean {
  if (message.kind === 'readings') return message.readings.every(acceptable)
  try {
    const parsed = readingsMessageSchema.safeParse(JSON.parse(message.body))
    return parsed.success && parsed.data.readings.every(acceptable)
  } catch {
    return false
  }
}

describe('malformed messages', () => {
  it('the good batch itself passes the contract and the registry', () => {
    expect(messageIsAcceptable({ kind: 'readings', readings: batch(1) })).toBe(true)
  })

  it.each(MALFORMED_KINDS)('%s breaks the contract or the registry', (kind) => {
    expect(messageIsAcceptable(malformedMessage(kind, batch(1)))).toBe(false)
  })

  it('keeps sending the good readings beside the bad ones', () => {
    const outbox = new FaultyOutbox('malformed', mulberry32(11))
    let bad = 0
    for (let n = 0; n < 100; n++) {
      const out = outbox.next(batch(n))
      const goodTemps = out.flatMap((m) => (m.kind === 'readings' ? m.readings : [])).filter((r) => acceptable(r))
      expect(goodTemps.length).toBeGreaterThanOrEqual(4)
      if (out.some((m) => !messageIsAcceptable(m))) bad++
    }
    expect(bad).toBeGreaterThan(25)
    expect(bad).toBeLessThan(75)
  })
})

describe('duplicates and out-of-order batches', () => {
  const run = (seed: number) => {
    const outbox = new FaultyOutbox('duplicates_and_out_of_order', mulberry32(seed))
    const sent: DeviceReading[][] = []
    for (let n = 0; n < 200; n++) {
      for (const m of outbox.next(batch(n))) if (m.kind === 'readings') sent.push(m.readings as DeviceReading[])
    }
    return sent
  }

  it('re-sends earlier batches, sends some late, and shuffles readings', () => {
    const sent = run(5)
    const times = sent.map((b) => Date.parse(b[0].time))
    const distinct = new Set(times)
    expect(sent.length - distinct.size).toBeGreaterThan(20)
    const late = times.filter((t, i) => i > 0 && t < times[i - 1]).length
    expect(late).toBeGreaterThan(20)
    expect(sent.some((b) => b[0].metric !== 'temperature')).toBe(true)
    // Every batch but possibly the one still held back reaches the wire.
    expect(distinct.size).toBeGreaterThanOrEqual(199)
    for (const b of sent) expect(b.map((r) => r.metric).sort()).toEqual(['light', 'ph', 'temperature', 'water_level'])
  })

  it('is deterministic for a seed', () => {
    expect(run(9)).toEqual(run(9))
  })
})
