import { describe, expect, it } from 'vitest'
import { evaluate } from '@shared/rules/evaluate'
import { occurrenceAt, occurrencesBetween, windowCovers } from '@shared/rules/maintenance'
import { watchRuleSpecSchema } from '@shared/rules/schema'
import { initialRuleState } from '@shared/rules/types'

// UK summer time began at 01:00 UTC on Sunday 29 March 2026 (the last Sunday of March): The
// Summer Time Order 2002 (SI 2002/262), UK; the 2026 date follows from its rule.
const TUESDAY_0900 = { weekday: 1, startMinute: 9 * 60, durationMinutes: 90 }
const utc = (iso: string) => Date.parse(iso)

describe('maintenance windows in the site zone', () => {
  it('a weekly Tuesday 09:00–10:30 window stays at 09:00 on the wall clock across the change to summer time', () => {
    expect(occurrenceAt(TUESDAY_0900, utc('2026-03-24T09:15:00Z'), 'Europe/London')).toEqual([utc('2026-03-24T09:00:00Z'), utc('2026-03-24T10:30:00Z')])
    expect(occurrenceAt(TUESDAY_0900, utc('2026-03-31T08:15:00Z'), 'Europe/London')).toEqual([utc('2026-03-31T08:00:00Z'), utc('2026-03-31T09:30:00Z')])
    expect(windowCovers(TUESDAY_0900, utc('2026-03-31T09:45:00Z'), 'Europe/London')).toBe(false) // 10:45 local
    expect(windowCovers(TUESDAY_0900, utc('2026-03-25T09:15:00Z'), 'Europe/London')).toBe(false) // a Wednesday
  })

  it('a window past midnight covers the small hours of the next day; a one-off covers only its span', () => {
    const late = { weekday: 4, startMinute: 23 * 60, durationMinutes: 120 } // Friday 23:00–01:00
    expect(windowCovers(late, utc('2026-07-17T23:30:00Z'), 'UTC')).toBe(true) // Saturday 00:30 UTC is still Friday's window
    const once = { startsAt: utc('2026-07-01T10:00:00Z'), endsAt: utc('2026-07-01T11:00:00Z') }
    expect(windowCovers(once, utc('2026-07-01T10:59:59Z'), 'UTC')).toBe(true)
    expect(windowCovers(once, utc('2026-07-01T11:00:00Z'), 'UTC')).toBe(false)
  })

  it('lists a week of occurrences for the roster', () => {
    const week = occurrencesBetween(TUESDAY_0900, utc('2026-03-23T00:00:00Z'), utc('2026-04-06T00:00:00Z'), 'Europe/London')
    expect(week).toEqual([
      [utc('2026-03-24T09:00:00Z'), utc('2026-03-24T10:30:00Z')],
      [utc('2026-03-31T08:00:00Z'), utc('2026-03-31T09:30:00Z')],
    ])
  })
})

describe('what a missing reading means to a rule', () => {
  const MIN = 60_000
  const spec = (missingReading: 'keep' | 'tripped' | 'clear') =>
    watchRuleSpecSchema.parse({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 0, clearMargin: 0.5, missingReading })

  it('keep: the last state stands however long the readings stop', () => {
    const tripped = evaluate(spec('keep'), initialRuleState(), { type: 'reading', at: 0, value: 29 }).state
    expect(evaluate(spec('keep'), tripped, { type: 'tick', at: 120 * MIN })).toEqual({ state: tripped })
  })

  it('tripped: 15 minutes without a reading trips the rule, dated when the reading went missing', () => {
    const clear = evaluate(spec('tripped'), initialRuleState(), { type: 'reading', at: 0, value: 25 }).state
    expect(evaluate(spec('tripped'), clear, { type: 'tick', at: 14 * MIN }).event).toBeUndefined()
    const result = evaluate(spec('tripped'), clear, { type: 'tick', at: 20 * MIN })
    expect(result.event).toEqual({ type: 'trip', at: 15 * MIN, value: 25, since: 15 * MIN })
    expect(evaluate(spec('tripped'), result.state, { type: 'tick', at: 30 * MIN }).event).toBeUndefined() // once
  })

  it('clear: a tripped rule clears once its readings are missing, and waits for a fresh one', () => {
    const tripped = evaluate(spec('clear'), initialRuleState(), { type: 'reading', at: 0, value: 29 }).state
    const result = evaluate(spec('clear'), tripped, { type: 'tick', at: 16 * MIN })
    expect(result.event).toEqual({ type: 'clear', at: 15 * MIN })
    expect(result.state.status).toBe('clear')
    expect(evaluate(spec('clear'), result.state, { type: 'tick', at: 40 * MIN }).event).toBeUndefined()
  })
})
