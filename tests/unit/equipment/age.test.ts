import { describe, expect, it } from 'vitest'
import { ageBetween, ageText } from '@shared/equipment/age'

// Calendar arithmetic, worked by hand: a month is counted when the day of the month comes round
// again, or the month's last day when it is shorter.
describe('equipment age', () => {
  it('counts whole years, months and days on the calendar', () => {
    expect(ageBetween('2024-09-01', '2026-12-05')).toEqual({ years: 2, months: 3, days: 4 })
    expect(ageBetween('2026-01-31', '2026-03-01')).toEqual({ years: 0, months: 1, days: 1 })
    expect(ageBetween('2025-12-20', '2026-01-05')).toEqual({ years: 0, months: 0, days: 16 })
    // A 29 February anniversary falls on 28 February in other years.
    expect(ageBetween('2024-02-29', '2025-02-28')).toEqual({ years: 1, months: 0, days: 0 })
    expect(ageBetween('2026-12-06', '2026-12-05')).toEqual({ years: 0, months: 0, days: 0 })
  })

  it('says the two largest parts', () => {
    expect(ageText({ years: 2, months: 3, days: 4 })).toBe('2 years 3 months')
    expect(ageText({ years: 1, months: 0, days: 9 })).toBe('1 year')
    expect(ageText({ years: 0, months: 1, days: 1 })).toBe('1 month')
    expect(ageText({ years: 0, months: 0, days: 16 })).toBe('16 days')
    expect(ageText({ years: 0, months: 0, days: 0 })).toBe('today')
  })
})
