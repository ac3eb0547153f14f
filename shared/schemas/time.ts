import { z } from 'zod'
import { parseLocalDate } from '../time/zoned'

/**
 * The earliest and latest instants the API accepts. PostgreSQL refuses year 0 (there is none in
 * its calendar) and JavaScript dates end in year 275760; neither bound means anything for a tank.
 * Nothing the product records (readings, care, incidents, rosters) is older than 1970 or later
 * than 2199, so everything outside is a typing slip or a probe, answered with a 400 naming the field.
 */
export const EARLIEST_INSTANT = '1970-01-01T00:00:00Z'
export const LATEST_INSTANT = '2199-12-31T23:59:59.999Z'
const EARLIEST_MS = Date.parse(EARLIEST_INSTANT)
const LATEST_MS = Date.parse(LATEST_INSTANT)

export const INSTANT_FORMAT_MESSAGE = 'use an ISO 8601 date-time with an offset, e.g. 2026-03-01T12:00:00Z'
export const INSTANT_RANGE_MESSAGE = 'must be between 1970-01-01 and 2199-12-31'

export const OFFSET_RANGE_MESSAGE = 'the offset must be between -12:00 and +14:00'

/** Offsets in use on Earth run from -12:00 to +14:00; PostgreSQL refuses some beyond (e.g. +23:59). */
function offsetInRange(text: string): boolean {
  const match = /([+-])(\d\d):?(\d\d)$/.exec(text)
  if (!match) return true // Z
  const minutes = (match[1] === '-' ? -1 : 1) * (Number(match[2]) * 60 + Number(match[3]))
  return minutes >= -12 * 60 && minutes <= 14 * 60
}

/** True when `ms` lies in the range every stored or queried instant must keep to. */
export const instantInRange = (ms: number) => Number.isFinite(ms) && ms >= EARLIEST_MS && ms <= LATEST_MS

/**
 * The one schema for every instant the API reads (query parameters, body fields, the live socket's
 * `since`): ISO 8601 with an offset (a bare local time would be read in the server's own zone), a
 * real calendar date, seconds 00–59 (no leap second 60), a real offset, and within the range above. Kept as text.
 */
export const instantSchema = z.iso
  .datetime({ offset: true, message: INSTANT_FORMAT_MESSAGE })
  .refine(offsetInRange, OFFSET_RANGE_MESSAGE)
  .refine((text) => instantInRange(Date.parse(text)), INSTANT_RANGE_MESSAGE)

/** The same, read as a Date. */
export const instantDateSchema = instantSchema.transform((text) => new Date(text))

export const LOCAL_DATE_FORMAT_MESSAGE = 'use a calendar date, YYYY-MM-DD'
export const LOCAL_DATE_RANGE_MESSAGE = 'must be between 1970-01-01 and 2199-12-31'

function localDateProblem(text: string): string | null {
  try {
    const { year } = parseLocalDate(text)
    return year >= 1970 && year <= 2199 ? null : LOCAL_DATE_RANGE_MESSAGE
  } catch {
    return LOCAL_DATE_FORMAT_MESSAGE
  }
}

/** A calendar date on a site's calendar (`YYYY-MM-DD`), in the same years as `instantSchema`. */
export const localDateSchema = z.string().superRefine((text, check) => {
  const problem = localDateProblem(text)
  if (problem) check.addIssue({ code: 'custom', message: problem })
})
