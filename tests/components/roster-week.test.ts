import { flushPromises } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { RosterWeekSpan } from '@shared/schemas/roster'
import RosterWeek from '@/components/roster/RosterWeek.vue'
import { layoutWeek, mondayOf, moveWeek } from '@/components/roster/week-layout'
import { mountView } from './mount'

// Europe/Berlin is UTC+1 until the last Sunday of March (29 March 2026), when clocks go from
// 02:00 to 03:00 local, at 01:00 UTC (Directive 2000/84/EC, Article 2).
const ZONE = 'Europe/Berlin'
const night: RosterWeekSpan = { userId: 21, name: 'Sam Keeper', startsAt: '2026-03-02T21:00:00.000Z', endsAt: '2026-03-03T05:00:00.000Z', source: 'pattern' }
const day: RosterWeekSpan = { userId: 7, name: 'Alex Owner', startsAt: '2026-03-03T07:00:00.000Z', endsAt: '2026-03-03T15:00:00.000Z', source: 'override' }

describe('week layout', () => {
  it('cuts a 22:00–06:00 night at midnight onto Monday and Tuesday', () => {
    const days = layoutWeek([night], '2026-03-02', ZONE)
    expect(days.map((d) => d.date)).toEqual(['2026-03-02', '2026-03-03', '2026-03-04', '2026-03-05', '2026-03-06', '2026-03-07', '2026-03-08'])
    const [monday, tuesday, ...rest] = days
    expect(monday!.blocks).toHaveLength(1)
    expect(monday!.blocks[0]).toMatchObject({ name: 'Sam Keeper', label: '22:00–06:00', continuesFromDayBefore: false, continuesNextDay: true })
    expect(monday!.blocks[0]!.topPct).toBeCloseTo((22 / 24) * 100, 6)
    expect(monday!.blocks[0]!.heightPct).toBeCloseTo((2 / 24) * 100, 6)
    expect(tuesday!.blocks[0]).toMatchObject({ label: '22:00–06:00', topPct: 0, continuesFromDayBefore: true, continuesNextDay: false })
    expect(tuesday!.blocks[0]!.heightPct).toBeCloseTo(25, 6)
    expect(rest.every((d) => d.blocks.length === 0)).toBe(true)
  })

  it('fills a 23-hour day in proportion', () => {
    // Saturday 28 March 22:00 CET to Sunday 06:00 CEST: 2 h on Saturday, 5 real hours of Sunday's 23.
    const span: RosterWeekSpan = { userId: 21, name: 'Sam Keeper', startsAt: '2026-03-28T21:00:00.000Z', endsAt: '2026-03-29T04:00:00.000Z', source: 'pattern' }
    const days = layoutWeek([span], '2026-03-23', ZONE)
    expect(days[6]!.blocks[0]!.label).toBe('22:00–06:00')
    expect(days[6]!.blocks[0]!.heightPct).toBeCloseTo((5 / 23) * 100, 6)
  })

  it('puts people on duty at the same time side by side', () => {
    const overlap: RosterWeekSpan = { ...day, startsAt: '2026-03-03T04:00:00.000Z', endsAt: '2026-03-03T07:00:00.000Z' }
    const tuesday = layoutWeek([night, overlap], '2026-03-02', ZONE)[1]!
    expect(tuesday.blocks.map((b) => [b.name, b.lane, b.lanes])).toEqual([
      ['Sam Keeper', 0, 2],
      ['Alex Owner', 1, 2],
    ])
  })

  it('finds the Monday in the site’s zone and moves by weeks', () => {
    // Sunday 8 March 23:30 UTC is already Monday 9 March 00:30 in Berlin.
    expect(mondayOf(ZONE, Date.parse('2026-03-08T23:30:00Z'))).toBe('2026-03-09')
    expect(mondayOf('UTC', Date.parse('2026-03-08T23:30:00Z'))).toBe('2026-03-02')
    expect(moveWeek('2026-03-02', 1)).toBe('2026-03-09')
    expect(moveWeek('2026-03-05', 0)).toBe('2026-03-02')
    expect(moveWeek('2026-03-02', -1)).toBe('2026-02-23')
  })
})

describe('RosterWeek', () => {
  it('draws the night in Monday’s and Tuesday’s columns, named and timed', async () => {
    const { wrapper } = await mountView(RosterWeek, { props: { spans: [night, day], timeZone: ZONE, start: '2026-03-02', thisWeek: '2026-03-02' } })
    await flushPromises()
    const column = (date: string) => wrapper.find(`[data-test="roster-day-${date}"]`)
    expect(column('2026-03-02').find('.tw-week__head').text()).toBe('Mon 2 Mar')
    const monday = column('2026-03-02').findAll('[data-test="roster-block"]')
    expect(monday.map((b) => b.text())).toEqual(['Sam Keeper 22:00–06:00 ↓'])
    expect(monday[0]!.attributes('style')).toContain('top: 91.66')
    const tuesday = column('2026-03-03').findAll('[data-test="roster-block"]')
    expect(tuesday.map((b) => b.text())).toEqual(['Sam Keeper ↑ 22:00–06:00', 'Alex Owner 08:00–16:00'])
    expect(tuesday[0]!.attributes('style')).toContain('top: 0%')
    expect(tuesday[1]!.classes()).toContain('tw-week__block--added')
    expect(column('2026-03-04').findAll('[data-test="roster-block"]')).toHaveLength(0)
  })
})
