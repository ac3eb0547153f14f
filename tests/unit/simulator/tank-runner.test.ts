import { describe, expect, it } from 'vitest'
import { deviceReadingSchema } from '@shared/ingest/contract'
import { isMetricKey, METRICS } from '@shared/metrics'
import { FaultyOutbox } from '../../../simulator/model/faults'
import { mulberry32 } from '../../../simulator/model/random'
import { formatSummary, runTick, type SimulatedNode } from '../../../simulator/runner'
import type { SendOutcome, Transport } from '../../../simulator/transport/types'
import { HOUR_S, simulate } from './fixtures'

function fakeTransport(answer: (body: string) => SendOutcome) {
  const bodies: string[] = []
  const transport: Transport = {
    kind: 'http',
    send: async (readings) => {
      const body = JSON.stringify({ v: 1, readings })
      bodies.push(body)
      return answer(body)
    },
    sendRaw: async (body) => {
      bodies.push(body)
      return answer(body)
    },
    close: async () => {},
  }
  return { transport, bodies }
}

const accepted = (body: string): SendOutcome => {
  const n = (JSON.parse(body) as { readings: unknown[] }).readings.length
  return { delivered: true, status: 200, summary: { accepted: n, duplicates: 0, rejected: 0, results: [] } }
}

function node(sim: ReturnType<typeof simulate>, transport: Transport, outbox: FaultyOutbox | null = null): SimulatedNode {
  return { tankName: sim.spec.name, deviceId: 1, sim, transport, outbox, retryQueue: [] }
}

describe('simulated readings', () => {
  it('report the four metrics in canonical units, valid and plausible, over a whole day', () => {
    const sim = simulate({ kind: 'planted' })
    for (let h = 0; h < 24; h++) {
      sim.advance(HOUR_S)
      const readings = sim.readings(new Date(sim.snapshot().simMs).toISOString())
      expect(readings.map((r) => r.metric)).toEqual(['temperature', 'ph', 'light', 'water_level'])
      for (const r of readings) {
        expect(deviceReadingSchema.safeParse(r).success).toBe(true)
        if (!isMetricKey(r.metric)) throw new Error(r.metric)
        expect(r.unit).toBe(METRICS[r.metric].unit)
        expect(r.value).toBeGreaterThanOrEqual(METRICS[r.metric].plausible.min)
        expect(r.value).toBeLessThanOrEqual(METRICS[r.metric].plausible.max)
      }
    }
  })
})

describe('tick', () => {
  it('sends one batch per node and adds up the server verdicts', async () => {
    const a = fakeTransport(accepted)
    const b = fakeTransport(accepted)
    const nodes = [node(simulate({}), a.transport), node(simulate({ name: 'Other' }), b.transport)]
    const summary = await runTick(nodes, 1, 10, new Date(Date.UTC(2024, 0, 15, 12)))
    expect(a.bodies).toHaveLength(1)
    expect(JSON.parse(a.bodies[0])).toMatchObject({ v: 1, readings: [{ time: '2024-01-15T12:00:00.000Z' }, {}, {}, {}] })
    expect(summary).toMatchObject({ nodes: 2, messages: 2, readings: 8, delivered: 2, accepted: 8, failed: 0, quiet: 0 })
    expect(formatSummary(summary, 'http')).toContain('accepted 8 dup 0 rejected 0')
  })

  it('sends nothing from a quiet node once its quiet time has come', async () => {
    const fake = fakeTransport(accepted)
    const quiet = node(simulate({}, { plan: { scenario: 'sensor_quiet', startAfterS: 300, repeatEveryS: null } }), fake.transport)
    await runTick([quiet], 1, 200, new Date())
    const summary = await runTick([quiet], 2, 200, new Date())
    expect(fake.bodies).toHaveLength(1)
    expect(summary.quiet).toBe(1)
    expect(summary.messages).toBe(0)
  })

  it('keeps batches the app could not take (503) and sends them first next time', async () => {
    let down = true
    const fake = fakeTransport((body) => (down ? { delivered: false, status: 503, retryAfterS: 5, error: 'database down' } : accepted(body)))
    const n = node(simulate({}), fake.transport)
    const first = await runTick([n], 1, 10, new Date(Date.UTC(2024, 0, 15, 12, 0, 0)))
    expect(first.failed).toBe(1)
    expect(n.retryQueue).toHaveLength(1)
    down = false
    const second = await runTick([n], 2, 10, new Date(Date.UTC(2024, 0, 15, 12, 0, 10)))
    expect(second).toMatchObject({ messages: 2, delivered: 2, accepted: 8 })
    const times = fake.bodies.slice(1).map((b) => (JSON.parse(b) as { readings: { time: string }[] }).readings[0].time)
    expect(times).toEqual(['2024-01-15T12:00:00.000Z', '2024-01-15T12:00:10.000Z'])
  })

  it('does not retry a batch the app refused for good (400)', async () => {
    const fake = fakeTransport(() => ({ delivered: false, status: 400, error: 'malformed' }))
    const n = node(simulate({}), fake.transport, new FaultyOutbox('malformed', mulberry32(1)))
    await runTick([n], 1, 10, new Date())
    expect(n.retryQueue).toHaveLength(0)
  })
})
