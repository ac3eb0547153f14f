import { describe, expect, it } from 'vitest'
import { fromLocalInputValue, isoToSiteInput, siteInputToIso, toLocalInputValue } from '@shared/time'

// Europe/Berlin is UTC+1 until the last Sunday of March (29 March 2026), when clocks go from
// 02:00 to 03:00 local, at 01:00 UTC (Directive 2000/84/EC, Article 2).
const ZONE = 'Europe/Berlin'

describe('datetime-local values', () => {
  it('reads typed times as the site’s clock, whatever the viewer’s zone', () => {
    expect(siteInputToIso('2026-03-02T22:00', ZONE)).toBe('2026-03-02T21:00:00.000Z')
    expect(siteInputToIso('2026-07-02T22:00', ZONE)).toBe('2026-07-02T20:00:00.000Z')
    expect(isoToSiteInput('2026-03-02T21:00:00.000Z', ZONE)).toBe('2026-03-02T22:00')
    expect(siteInputToIso('not a time', ZONE)).toBeNull()
  })

  it('round-trips an instant through the viewer’s own clock to the minute', () => {
    const at = new Date(2026, 2, 2, 22, 5)
    expect(toLocalInputValue(at)).toBe('2026-03-02T22:05')
    expect(fromLocalInputValue('2026-03-02T22:05')?.getTime()).toBe(at.getTime())
    expect(fromLocalInputValue('')).toBeNull()
    expect(fromLocalInputValue('2026-13-45T99:00')).toBeNull()
  })
})
