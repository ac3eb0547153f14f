import { describe, expect, it } from 'vitest'
import { MAX_PAYLOAD_BYTES, decodeEvent, encodeEvent } from '../../server/platform/cluster/codec'
import type { StoredReading } from '../../server/platform/events'

const rows = (n: number): StoredReading[] =>
  Array.from({ length: n }, (_, i) => ({
    tankId: 1000 + (i % 7),
    metric: i % 2 ? 'temperature' : 'water_level',
    time: new Date(1_796_000_000_000 + i * 1000),
    value: 20 + i / 1000,
    source: i % 3 ? 'device' : 'test_kit',
  }))

describe('cluster event codec', () => {
  it('splits a large batch of readings into payloads under the NOTIFY limit and reads every row back', () => {
    const batch = rows(5000)
    const payloads = encodeEvent('inst-a:1', 'readings.stored', [batch])
    expect(payloads.length).toBeGreaterThan(20)
    for (const p of payloads) expect(Buffer.byteLength(p)).toBeLessThan(MAX_PAYLOAD_BYTES)
    const decoded = payloads.map((p) => decodeEvent(p)!)
    expect(decoded.every((d) => d.origin === 'inst-a:1' && d.event === 'readings.stored')).toBe(true)
    expect(decoded.flatMap((d) => d.args[0] as StoredReading[])).toEqual(batch)
  })

  it('sends a small batch as one payload and other events as they are', () => {
    expect(encodeEvent('o', 'readings.stored', [rows(3)])).toHaveLength(1)
    const change = { incidentId: 5, tankId: 9, siteId: 2, state: 'acknowledged' }
    const [payload] = encodeEvent('o', 'incident.changed', [change])
    expect(decodeEvent(payload)).toEqual({ origin: 'o', event: 'incident.changed', args: [change] })
  })

  it('ignores payloads that are not ours', () => {
    expect(decodeEvent('not json')).toBeNull()
    expect(decodeEvent('{"o":"x","e":"mail.attempted","d":{}}')).toBeNull()
    expect(decodeEvent('{"o":"x","e":"readings.stored","d":5}')).toBeNull()
  })
})
