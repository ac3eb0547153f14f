import { describe, expect, it } from 'vitest'
import { messageOutcome, messageRefused } from '@shared/ingest/contract'
import { describeOutcome } from '../../simulator/transport/mqtt'

describe('outcome lines of the simulated nodes', () => {
  it('says nothing about a message stored whole', () => {
    expect(describeOutcome(messageOutcome(3, { accepted: 2, duplicates: 0, rejected: 0, results: [] }))).toBeNull()
  })

  it('names a refused message with its reason and field', () => {
    expect(describeOutcome(messageRefused(7, 'payload is not valid JSON', 'body'))).toBe('message 7 refused: payload is not valid JSON (body)')
  })

  it('names the first rejected reading of a partly stored one', () => {
    const outcome = messageOutcome(null, {
      accepted: 1,
      duplicates: 0,
      rejected: 1,
      results: [
        { index: 0, outcome: 'accepted' },
        { index: 1, outcome: 'rejected', reason: 'unknown metric "x"', field: 'readings.1.metric' },
      ],
    })
    expect(outcome.outcome).toBe('stored')
    expect(describeOutcome(outcome)).toBe('a QoS 0 message: 1 of 2 readings rejected; first: readings.1.metric: unknown metric "x"')
  })
})
