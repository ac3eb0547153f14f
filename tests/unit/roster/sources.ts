// Daylight-saving rules restated from the law, computed here independently of the code under
// test so the tests can catch a wrong zone lookup rather than agree with it.
//
// EU: Directive 2000/84/EC of the European Parliament and of the Council (19 January 2001),
//   Art. 2: summer time begins at 01:00 GMT on the last Sunday in March; Art. 3: it ends at
//   01:00 GMT on the last Sunday in October.
// Germany: Einheiten- und Zeitgesetz (EinhZeitG, 1985 as amended) § 4: legal time is CET =
//   UTC + 1 h, and CEST = UTC + 2 h during summer time.
// US: 15 U.S.C. § 260a(a) (Uniform Time Act of 1966 § 3(a), as amended by the Energy Policy
//   Act of 2005, Pub. L. 109-58 § 110): standard time is advanced one hour from 2 o'clock
//   antemeridian on the second Sunday of March to 2 o'clock antemeridian on the first Sunday
//   of November. 15 U.S.C. § 261: Eastern is the zone of the 75th meridian west, so standard
//   time is UTC − 5 h (75° ÷ 15° per hour) and daylight time UTC − 4 h.

export const HOUR_MS = 3_600_000
export const CET = 1 * HOUR_MS
export const CEST = 2 * HOUR_MS
export const EST = -5 * HOUR_MS
export const EDT = -4 * HOUR_MS

const sundaysOf = (year: number, month: number): number[] => {
  const days: number[] = []
  for (let day = 1; day <= 31; day++) {
    const date = new Date(Date.UTC(year, month - 1, day))
    if (date.getUTCMonth() !== month - 1) break
    if (date.getUTCDay() === 0) days.push(day)
  }
  return days
}

export const lastSunday = (year: number, month: number): number => sundaysOf(year, month).at(-1) as number
export const nthSunday = (year: number, month: number, n: number): number => sundaysOf(year, month)[n - 1] as number

/** Art. 2 and 3 of 2000/84/EC: 01:00 GMT. */
export const euSummerStarts = (year: number) => Date.UTC(year, 2, lastSunday(year, 3), 1)
export const euSummerEnds = (year: number) => Date.UTC(year, 9, lastSunday(year, 10), 1)

/** 15 U.S.C. § 260a: 02:00 local standard time in March, 02:00 local daylight time in November. */
export const easternDaylightStarts = (year: number) => Date.UTC(year, 2, nthSunday(year, 3, 2), 2) - EST
export const easternDaylightEnds = (year: number) => Date.UTC(year, 10, nthSunday(year, 11, 1), 2) - EDT

/** `'2026-01-05T06:00'` read at a fixed offset, the offset coming from the sources above. */
export const wallAt = (local: string, offsetMs: number): number => Date.parse(`${local}:00Z`) - offsetMs
