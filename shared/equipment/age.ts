// How old a piece of equipment is, in calendar years, months and days between two local dates.
import { plural } from '../plural'
import { parseLocalDate, type LocalDate } from '../time/zoned'

export interface Age {
  years: number
  months: number
  days: number
}

const daysInMonth = (year: number, month: number) => new Date(Date.UTC(year, month, 0)).getUTCDate()

/** `date` moved on by whole months, kept within the target month (31 Jan + 1 month = 28 or 29 Feb). */
function plusMonths(date: LocalDate, months: number): LocalDate {
  const total = date.year * 12 + (date.month - 1) + months
  const year = Math.floor(total / 12)
  const month = (total % 12) + 1
  return { year, month, day: Math.min(date.day, daysInMonth(year, month)) }
}

const dayNumber = (d: LocalDate) => Math.round(Date.UTC(d.year, d.month - 1, d.day) / 86_400_000)

/** Whole calendar years, months and days from `from` to `to` (`YYYY-MM-DD`); zero when `to` is earlier. */
export function ageBetween(from: string, to: string): Age {
  const a: LocalDate = parseLocalDate(from)
  const b: LocalDate = parseLocalDate(to)
  if (dayNumber(b) <= dayNumber(a)) return { years: 0, months: 0, days: 0 }
  let months = (b.year - a.year) * 12 + (b.month - a.month)
  if (dayNumber(plusMonths(a, months)) > dayNumber(b)) months -= 1
  const days = dayNumber(b) - dayNumber(plusMonths(a, months))
  return { years: Math.floor(months / 12), months: months % 12, days }
}

/** "2 years 3 months", "5 months", "12 days", "today": the two largest non-zero parts at most, years and months first. */
export function ageText(age: Age): string {
  if (age.years) return age.months ? `${plural(age.years, 'year')} ${plural(age.months, 'month')}` : plural(age.years, 'year')
  if (age.months) return plural(age.months, 'month')
  return age.days ? plural(age.days, 'day') : 'today'
}
