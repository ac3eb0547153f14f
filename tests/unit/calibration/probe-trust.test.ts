import { describe, expect, it } from 'vitest'
import { PROBE_TRUST, probeKitDifference, spikeIndexes } from '@shared/calibration'

// Tolerances, noise floors and spike sizes are `common practice`, not a published standard.
describe('probeKitDifference', () => {
  it('pH: 0.2 apart is still agreement, more is not', () => {
    const { tolerance } = PROBE_TRUST.ph!
    expect(probeKitDifference(7.0, 7.2, tolerance).disagrees).toBe(false)
    const off = probeKitDifference(7.0, 7.35, tolerance)
    expect(off.disagrees).toBe(true)
    expect(off.difference).toBeCloseTo(0.35, 9)
  })
  it('conductivity: 5 % of the kit value', () => {
    const { tolerance } = PROBE_TRUST.conductivity!
    expect(probeKitDifference(400, 419, tolerance).disagrees).toBe(false)
    expect(probeKitDifference(400, 421, tolerance)).toMatchObject({ disagrees: true, limit: 20 })
  })
})

describe('spikeIndexes', () => {
  it('a single reading far from both neighbours that agree is a spike', () => {
    expect(spikeIndexes([25, 25.1, 31, 25.1, 25], { amount: 2, percent: 0 })).toEqual([2])
  })
  it('a step that stays is not', () => {
    expect(spikeIndexes([25, 25, 29, 29.1, 29], { amount: 2, percent: 0 })).toEqual([])
  })
  it('relative sizes for conductivity', () => {
    expect(spikeIndexes([400, 402, 600, 401], { amount: 0, percent: 20 })).toEqual([2])
    expect(spikeIndexes([400, 402, 450, 401], { amount: 0, percent: 20 })).toEqual([])
  })
})
