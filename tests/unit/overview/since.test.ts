import { describe, expect, it } from 'vitest'
import { endOfYesterdaysWorkday, minutesToAcknowledge } from '@shared/overview/since'
import { numberedNames } from '@shared/tank-names'

// Offsets: Directive 2000/84/EC (European Parliament and Council, 2001) Art. 2–3 puts the 2026
// change to summer time at 01:00 UTC on 29 March; Berlin is UTC+01:00 before it and UTC+02:00 after
// (EinhZeitG § 4). New York moves on the second Sunday of March, 8 March 2026 (15 U.S.C. § 260a).
describe("the end of yesterday's working day", () => {
  it("is 18:00 yesterday on the site's clock", () => {
    expect(new Date(endOfYesterdaysWorkday('Europe/Berlin', Date.parse('2026-03-10T07:00:00Z'))).toISOString()).toBe('2026-03-09T17:00:00.000Z')
    expect(new Date(endOfYesterdaysWorkday('America/New_York', Date.parse('2026-03-10T12:00:00Z'))).toISOString()).toBe('2026-03-09T22:00:00.000Z')
  })

  it("follows the site's date, not UTC's: 23:30 UTC is already tomorrow in Berlin", () => {
    expect(new Date(endOfYesterdaysWorkday('Europe/Berlin', Date.parse('2026-03-09T23:30:00Z'))).toISOString()).toBe('2026-03-09T17:00:00.000Z')
  })

  it('keeps 18:00 across a change of clocks (Berlin, 29 March 2026)', () => {
    expect(new Date(endOfYesterdaysWorkday('Europe/Berlin', Date.parse('2026-03-30T06:00:00Z'))).toISOString()).toBe('2026-03-29T16:00:00.000Z')
    expect(new Date(endOfYesterdaysWorkday('Europe/Berlin', Date.parse('2026-03-29T06:00:00Z'))).toISOString()).toBe('2026-03-28T17:00:00.000Z')
  })

  it('accepts another end of day', () => {
    expect(new Date(endOfYesterdaysWorkday('UTC', Date.parse('2026-03-10T07:00:00Z'), '17:30')).toISOString()).toBe('2026-03-09T17:30:00.000Z')
  })
})

describe('minutes to acknowledge', () => {
  it('rounds to whole minutes and is null while unacknowledged', () => {
    const opened = new Date('2026-03-09T22:10:00Z')
    expect(minutesToAcknowledge(opened, new Date('2026-03-09T22:24:29Z'))).toBe(14)
    expect(minutesToAcknowledge(opened, new Date('2026-03-09T22:24:31Z'))).toBe(15)
    expect(minutesToAcknowledge(opened, null)).toBeNull()
  })
})

describe('numbered names for copies of a tank', () => {
  it('continues the number of the name, skipping names already taken', () => {
    expect(numberedNames('Rack 1', 3, ['Rack 1', 'rack 3'])).toEqual(['Rack 2', 'Rack 4', 'Rack 5'])
  })
  it('starts at 2 for a name without a number', () => {
    expect(numberedNames('Display', 2, ['Display'])).toEqual(['Display 2', 'Display 3'])
  })
})
