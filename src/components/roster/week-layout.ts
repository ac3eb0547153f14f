import type { RosterWeekSpan } from '@shared/schemas/roster'
import { addDays, formatLocalDate, localDateAt, localToInstant, parseLocalDate, weekdayOf } from '@shared/time/zoned'
import { formatClock, formatDay } from '@shared/time'

export const WEEKDAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const

/** The Monday (YYYY-MM-DD, in the site's zone) of the week holding `atMs`. */
export function mondayOf(timeZone: string, atMs: number): string {
  const today = localDateAt(timeZone, atMs)
  return formatLocalDate(addDays(today, -weekdayOf(today)))
}

/** The Monday `weeks` weeks away; any date snaps back to its own week's Monday first. */
export function moveWeek(start: string, weeks: number): string {
  const date = parseLocalDate(start)
  return formatLocalDate(addDays(date, weeks * 7 - weekdayOf(date)))
}

export interface WeekBlock {
  userId: number
  name: string
  /** The whole stretch of duty, e.g. "22:00–06:00", on every day it touches. */
  label: string
  /** Where this day's piece sits, in percent of the day from local midnight. */
  topPct: number
  heightPct: number
  continuesFromDayBefore: boolean
  continuesNextDay: boolean
  source: RosterWeekSpan['source']
  /** Side-by-side columns for people on duty at the same time. */
  lane: number
  lanes: number
}

export interface WeekDay {
  date: string
  label: string
  blocks: WeekBlock[]
}

/** Same-day pieces that overlap share the width; each gets the first free lane. */
function assignLanes(blocks: WeekBlock[]) {
  const sorted = [...blocks].sort((a, b) => a.topPct - b.topPct || a.userId - b.userId)
  const laneEnds: number[] = []
  for (const block of sorted) {
    let lane = laneEnds.findIndex((end) => end <= block.topPct)
    if (lane === -1) lane = laneEnds.length
    laneEnds[lane] = block.topPct + block.heightPct
    block.lane = lane
  }
  for (const block of blocks) block.lanes = Math.max(1, laneEnds.length)
}

/**
 * The seven local days from `start` with each stretch of duty cut at local midnights, so a
 * 22:00–06:00 night shows on both days. Days are measured in real time, so a 23-hour or
 * 25-hour day (clock change) still fills its column.
 */
export function layoutWeek(spans: readonly RosterWeekSpan[], start: string, timeZone: string): WeekDay[] {
  const first = parseLocalDate(start)
  return Array.from({ length: 7 }, (_, index) => {
    const date = addDays(first, index)
    const dayStart = localToInstant(timeZone, date, 0)
    const dayEnd = localToInstant(timeZone, addDays(date, 1), 0)
    const length = dayEnd - dayStart
    const blocks: WeekBlock[] = []
    for (const span of spans) {
      const startsAt = Date.parse(span.startsAt)
      const endsAt = Date.parse(span.endsAt)
      const from = Math.max(startsAt, dayStart)
      const to = Math.min(endsAt, dayEnd)
      if (to <= from) continue
      blocks.push({
        userId: span.userId,
        name: span.name,
        label: `${formatClock(startsAt, timeZone)}–${formatClock(endsAt, timeZone)}`,
        topPct: ((from - dayStart) / length) * 100,
        heightPct: ((to - from) / length) * 100,
        continuesFromDayBefore: startsAt < dayStart,
        continuesNextDay: endsAt > dayEnd,
        source: span.source,
        lane: 0,
        lanes: 1,
      })
    }
    assignLanes(blocks)
    return { date: formatLocalDate(date), label: formatDay(dayStart + length / 2, timeZone), blocks }
  })
}

/**
 * One colour per person, stable across weeks: picked from the id, not the order on screen.
 * None of the tank-state colours, which mean something else; the name is always written on the block.
 */
export const PERSON_COLORS = ['primary', 'secondary', 'info'] as const
export const personColor = (userId: number) => PERSON_COLORS[Math.abs(userId) % PERSON_COLORS.length]!
