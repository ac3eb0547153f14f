import { describe, expect, it } from 'vitest'
import { LIGHT_ON_LUX, lightDays, periodBox, scheduledHours, type LightSample } from '@/components/charts/light-cycle'

const MINUTE = 60_000

/** Readings every `stepMin` minutes from `startIso`, lux given by a function of the instant. */
function samples(startIso: string, hours: number, stepMin: number, lux: (ms: number) => number): LightSample[] {
  const start = Date.parse(startIso)
  const out: LightSample[] = []
  for (let ms = start; ms < start + hours * 60 * MINUTE; ms += stepMin * MINUTE) out.push({ t: new Date(ms).toISOString(), value: lux(ms) })
  return out
}

const between = (fromIso: string, toIso: string) => (ms: number) => (ms >= Date.parse(fromIso) && ms < Date.parse(toIso) ? 800 : 0)

describe('scheduledHours', () => {
  it('counts the photoperiod, across midnight when off comes first', () => {
    expect(scheduledHours({ on: '09:00', off: '19:00' })).toBe(10)
    expect(scheduledHours({ on: '22:00', off: '06:00' })).toBe(8)
    expect(scheduledHours({ on: '08:30', off: '16:45' })).toBe(8.25)
  })
})

describe('lightDays', () => {
  it('measures a 10-hour day in the site zone beside a 10-hour schedule', () => {
    // July in Berlin is CEST, UTC+2 (EU summer time, Directive 2000/84/EC): 09:00–19:00 local is 07:00–17:00 UTC.
    const readings = samples('2026-07-14T22:00:00Z', 24, 5, between('2026-07-15T07:00:00Z', '2026-07-15T17:00:00Z'))
    const days = lightDays(readings, { timeZone: 'Europe/Berlin', schedule: { on: '09:00', off: '19:00' }, untilMs: Date.parse('2026-07-15T22:00:00Z') })
    expect(days.map((d) => d.date)).toEqual(['2026-07-15'])
    const [day] = days
    expect(day!.measuredHours).toBe(10)
    expect(day!.scheduledHours).toBe(10)
    expect(day!.coveredHours).toBe(24)
    expect(day!.measured).toEqual([{ startMs: Date.parse('2026-07-15T07:00:00Z'), endMs: Date.parse('2026-07-15T17:00:00Z') }])
    expect(periodBox(day!.measured[0]!, day!)).toEqual({ left: 37.5, width: (100 * 10) / 24 })
  })

  it(`counts exactly ${LIGHT_ON_LUX} lux as on and one lux less as off`, () => {
    const readings: LightSample[] = [
      { t: '2026-07-15T10:00:00Z', value: LIGHT_ON_LUX },
      { t: '2026-07-15T10:30:00Z', value: LIGHT_ON_LUX - 1 },
      { t: '2026-07-15T11:00:00Z', value: 0 },
    ]
    const [day] = lightDays(readings, { timeZone: 'UTC', schedule: null, holdMs: 60 * MINUTE, untilMs: Date.parse('2026-07-15T11:30:00Z') })
    expect(day!.measuredHours).toBe(0.5)
    expect(day!.scheduledHours).toBeNull()
  })

  it('does not count an outage as light on, and says how much of the day was covered', () => {
    const on = samples('2026-07-15T08:00:00Z', 2, 5, () => 900)
    const later = samples('2026-07-15T14:00:00Z', 2, 5, () => 900)
    const [day] = lightDays([...on, ...later], { timeZone: 'UTC', schedule: null, untilMs: Date.parse('2026-07-15T16:00:00Z') })
    // Each reading holds at most 15 minutes (three five-minute steps), so the 4-hour gap is unknown.
    expect(day!.measuredHours).toBeCloseTo(2 + 2 + 10 / 60, 9)
    expect(day!.coveredHours).toBeCloseTo(day!.measuredHours, 9)
  })

  it('splits a period that runs over local midnight between the two calendar days', () => {
    const readings = samples('2026-07-15T20:00:00Z', 8, 10, between('2026-07-15T21:00:00Z', '2026-07-16T03:00:00Z'))
    const days = lightDays(readings, { timeZone: 'UTC', schedule: { on: '21:00', off: '03:00' }, untilMs: Date.parse('2026-07-16T04:00:00Z') })
    // Each calendar day holds 00:00–03:00 and 21:00–24:00 of the schedule: 6 hours.
    expect(days.map((d) => [d.date, d.measuredHours, d.scheduledHours])).toEqual([
      ['2026-07-15', 3, 6],
      ['2026-07-16', 3, 6],
    ])
  })

  it('gives the spring-forward day one scheduled hour less across the skipped hour', () => {
    // EU summer time starts on the last Sunday of March at 01:00 UTC (Directive 2000/84/EC, Art. 2):
    // 29 March 2026 in Berlin has no 02:00–03:00, so a 01:00–05:00 schedule lasts 3 hours.
    const readings = samples('2026-03-28T23:00:00Z', 6, 10, () => 0)
    const [day] = lightDays(readings, { timeZone: 'Europe/Berlin', schedule: { on: '01:00', off: '05:00' }, untilMs: Date.parse('2026-03-29T05:00:00Z') })
    expect(day!.date).toBe('2026-03-29')
    expect(day!.scheduledHours).toBe(3)
    expect(day!.dayEndMs - day!.dayStartMs).toBe(23 * 60 * MINUTE)
  })

  it('returns nothing without readings', () => {
    expect(lightDays([], { timeZone: 'UTC', schedule: { on: '09:00', off: '17:00' } })).toEqual([])
  })
})
