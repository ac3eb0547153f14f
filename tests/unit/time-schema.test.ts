import { describe, expect, it } from 'vitest'
import {
  INSTANT_FORMAT_MESSAGE,
  INSTANT_RANGE_MESSAGE,
  LOCAL_DATE_FORMAT_MESSAGE,
  LOCAL_DATE_RANGE_MESSAGE,
  OFFSET_RANGE_MESSAGE,
  instantDateSchema,
  instantSchema,
  localDateSchema,
} from '@shared/schemas/time'

const problem = (value: string) => {
  const result = instantSchema.safeParse(value)
  return result.success ? null : result.error.issues[0]!.message
}

describe('instantSchema', () => {
  it.each([
    ['2026-03-01T12:00:00Z'],
    ['2026-03-01T12:00:00.123456Z'],
    // The widest offsets in use: Line Islands (+14:00) and Baker Island (-12:00), IANA tz database (from memory).
    ['2026-03-01T12:00:00+14:00'],
    ['2026-03-01T12:00:00-12:00'],
    ['1970-01-01T00:00:00Z'],
    ['2199-12-31T23:59:59.999Z'],
    ['2024-02-29T00:00:00Z'],
  ])('accepts %s', (value) => expect(problem(value)).toBeNull())

  it.each([
    // PostgreSQL has no year 0 in its calendar (1 BC comes before AD 1) and refuses it.
    ['0000-01-01T00:00:00Z', INSTANT_RANGE_MESSAGE],
    ['1969-12-31T23:59:59Z', INSTANT_RANGE_MESSAGE],
    ['2200-01-01T00:00:00Z', INSTANT_RANGE_MESSAGE],
    ['9999-12-31T23:59:59Z', INSTANT_RANGE_MESSAGE],
    ['2026-03-01T12:00:00+23:59', OFFSET_RANGE_MESSAGE],
    ['2026-03-01T12:00:00+14:01', OFFSET_RANGE_MESSAGE],
    ['2026-03-01T12:00:00-12:01', OFFSET_RANGE_MESSAGE],
    // A leap second is written 23:59:60 (ITU-R TF.460-6); JavaScript and PostgreSQL disagree on it.
    ['2016-12-31T23:59:60Z', INSTANT_FORMAT_MESSAGE],
    ['+275760-09-13T00:00:00Z', INSTANT_FORMAT_MESSAGE],
    ['2026-02-29T00:00:00Z', INSTANT_FORMAT_MESSAGE],
    ['2026-03-01T12:00:00', INSTANT_FORMAT_MESSAGE],
  ])('refuses %s', (value, message) => expect(problem(value)).toBe(message))

  it('instantDateSchema reads the same text as a Date', () => {
    expect(instantDateSchema.parse('2026-03-01T12:00:00+14:00').toISOString()).toBe('2026-02-28T22:00:00.000Z')
  })
})

describe('localDateSchema', () => {
  const dateProblem = (value: string) => {
    const result = localDateSchema.safeParse(value)
    return result.success ? null : result.error.issues[0]!.message
  }
  it('accepts calendar dates from 1970 to 2199 and names what is wrong otherwise', () => {
    expect([dateProblem('2026-12-07'), dateProblem('1970-01-01'), dateProblem('2199-12-31')]).toEqual([null, null, null])
    expect([dateProblem('0100-02-28'), dateProblem('2200-01-01')]).toEqual([LOCAL_DATE_RANGE_MESSAGE, LOCAL_DATE_RANGE_MESSAGE])
    expect([dateProblem('0000-01-01'), dateProblem('2026-02-30'), dateProblem('7 Dec')]).toEqual([
      LOCAL_DATE_FORMAT_MESSAGE,
      LOCAL_DATE_FORMAT_MESSAGE,
      LOCAL_DATE_FORMAT_MESSAGE,
    ])
  })
})
