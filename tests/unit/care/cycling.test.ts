import { describe, expect, it } from 'vitest'
import { cyclingStatus, newPlantsNote, type KitTest } from '@shared/care/cycling'

// The "cycled" rule is `common practice` among keepers, not a published standard: ammonia
// ≤ 0.02 mg/L and nitrite ≤ 0.05 mg/L (zero at test-kit resolution) on every test for 7
// consecutive days, with nitrate present. The series below are made-up test results shaped
// like a fishless cycle, to exercise the rule, not measurements.
const DAY = 86_400_000
const T0 = Date.UTC(2026, 4, 1, 9)
const day = (n: number, values: Omit<KitTest, 'at'>): KitTest => ({ at: T0 + n * DAY, ...values })

const cycle: KitTest[] = [
  day(0, { ammonia: 2, nitrite: 0, nitrate: 0 }),
  day(4, { ammonia: 4, nitrite: 0.25, nitrate: 0 }),
  day(8, { ammonia: 1, nitrite: 2, nitrate: 5 }),
  day(12, { ammonia: 0.25, nitrite: 5, nitrate: 10 }),
  day(16, { ammonia: 0, nitrite: 1, nitrate: 20 }),
  day(20, { ammonia: 0, nitrite: 0, nitrate: 30 }),
  day(23, { ammonia: 0.02, nitrite: 0.05, nitrate: 40 }),
]

describe('cycling status', () => {
  it('reports no data without tests', () => {
    expect(cyclingStatus([])).toMatchObject({ phase: 'no_data', cycled: false, ammoniaPeak: null, nitritePeak: null, daysToGo: null })
  })

  it('is in the ammonia phase while ammonia climbs and nitrite has not appeared', () => {
    const s = cyclingStatus(cycle.slice(0, 2).map((t) => ({ ...t, nitrite: 0 })))
    expect(s.phase).toBe('ammonia')
    expect(s.ammoniaPeak).toEqual({ value: 4, at: new Date(T0 + 4 * DAY).toISOString(), passed: false })
  })

  it('finds both peaks and the nitrite phase', () => {
    const s = cyclingStatus(cycle.slice(0, 5))
    expect(s.phase).toBe('nitrite')
    expect(s.ammoniaPeak).toMatchObject({ value: 4, passed: true })
    expect(s.nitritePeak).toEqual({ value: 5, at: new Date(T0 + 12 * DAY).toISOString(), passed: true })
    expect(s.nitrateRising).toBe(true)
  })

  it('counts the zero run and is not cycled at 3 of 7 days', () => {
    const s = cyclingStatus(cycle)
    expect(s.phase).toBe('nitrate')
    expect(s.cycled).toBe(false)
    expect(s.zeroSince).toBe(new Date(T0 + 20 * DAY).toISOString())
    expect(s.zeroDays).toBe(3)
    expect(s.daysToGo).toBe(4)
  })

  it('is cycled once the zero run spans 7 days with nitrate present', () => {
    const s = cyclingStatus([...cycle, day(27, { ammonia: 0, nitrite: 0, nitrate: 40 })])
    expect(s).toMatchObject({ phase: 'cycled', cycled: true, zeroDays: 7, daysToGo: 0 })
  })

  it('restarts the run on a test above kit resolution (ammonia 0.03 or nitrite 0.1)', () => {
    const ammoniaBlip = cyclingStatus([...cycle, day(25, { ammonia: 0.03, nitrite: 0 }), day(27, { ammonia: 0, nitrite: 0, nitrate: 40 })])
    expect(ammoniaBlip).toMatchObject({ cycled: false, zeroSince: new Date(T0 + 27 * DAY).toISOString(), zeroDays: 0 })
    const nitriteBlip = cyclingStatus([...cycle, day(25, { nitrite: 0.1 }), day(33, { ammonia: 0, nitrite: 0, nitrate: 40 })])
    expect(nitriteBlip).toMatchObject({ cycled: false, zeroDays: 0 })
  })

  it('is not cycled without nitrate, however long ammonia and nitrite read zero', () => {
    const s = cyclingStatus([day(0, { ammonia: 0, nitrite: 0, nitrate: 0 }), day(10, { ammonia: 0, nitrite: 0, nitrate: 0 })])
    expect(s.cycled).toBe(false)
    expect(s.zeroDays).toBe(10)
  })

  it('needs both ammonia and nitrite tested in the run', () => {
    const s = cyclingStatus([day(0, { ammonia: 0, nitrate: 20 }), day(8, { ammonia: 0, nitrate: 25 })])
    expect(s).toMatchObject({ cycled: false, zeroSince: null })
  })
})

describe('new-plants note (common practice: first 14–21 days)', () => {
  const now = new Date(T0 + 30 * DAY)
  it('speaks up for plants added 10 days ago', () => {
    expect(newPlantsNote([new Date(T0), new Date(T0 + 20 * DAY)], now)).toMatchObject({ daysSince: 10, addedAt: new Date(T0 + 20 * DAY).toISOString() })
  })
  it('is silent once the newest plants are 21 days in', () => {
    expect(newPlantsNote([new Date(T0 + 9 * DAY)], now)).toBeNull()
  })
})
