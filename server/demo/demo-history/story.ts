// What happened in the invented shop over the last month: pure, from `now` and the demo tanks.
// Every date is placed on the site's own calendar, so last week always holds a fault or two.
import { defaultCareTasksFor, type CareTaskKind } from '@shared/care/defaults'
import { lastEndedPeriod } from '@shared/report/period'
import { addDays, localDateAt, localToInstant, weekdayOf, type LocalDate } from '@shared/time/zoned'
import type { KitValue } from '@shared/schemas/test-kit'
import type { TankKind } from '@shared/schemas/tanks'
import { mulberry32, seedFrom } from '../../../simulator/model/random'
import type { Episode } from './readings'

export const HISTORY_DAYS = 30
export const WATER_CHANGE_PERCENT = 12
const MINUTE_MS = 60_000
const HOUR_MS = 60 * MINUTE_MS
const DAY_MS = 24 * HOUR_MS

export interface StoryTank {
  name: string
  kind: TankKind
  stage: string
  timeZone: string
}

export const KEEPER_DAYS = 'keeper@marrowfen.example'
export const KEEPER_NIGHTS = 'keeper2@marrowfen.example'

/** Care done later than due, on purpose: the report and Care today show a shop that is mostly on time. */
export const PLANNED_LATE: ReadonlyArray<{ tank: string; kind: CareTaskKind; occurrence: number; daysLate: number }> = [
  { tank: 'Sales row A2', kind: 'glass_clean', occurrence: 1, daysLate: 1 },
  { tank: 'Reef display', kind: 'water_change', occurrence: 2, daysLate: 2 },
]

/** Local hour:minute each kind of work is usually done, on the site's calendar. */
const WORK_MINUTES: Record<CareTaskKind, number> = {
  water_change: 10 * 60,
  glass_clean: 9 * 60 + 30,
  test_kit_check: 11 * 60 + 30,
  filter_rinse: 14 * 60,
  media_replace: 15 * 60,
  substrate_clean: 15 * 60 + 30,
  equipment_service: 15 * 60 + 45,
  treatment_dose: 9 * 60,
  treatment_test: 9 * 60 + 15,
  other: 16 * 60,
}

export interface CareDone {
  tank: string
  kind: CareTaskKind
  at: number
  daysLate: number
  by: string
}

export interface TestKitPlan {
  tank: string
  at: number
  values: KitValue[]
  notes: string
  by: string
}

/** What keepers wrote on an incident the rules open during an episode. */
export interface IncidentNotes {
  tank: string
  episode: Episode['kind']
  ackAfterMs: number
  ackNote: string
  /** Resolved by a person before the rule cleared (else the rule's own clear resolves it). */
  resolveByHand?: { at: number; note: string }
}

export interface DemoStory {
  fromMs: number
  toMs: number
  episodes: Map<string, Episode[]>
  care: CareDone[]
  testKits: TestKitPlan[]
  incidentNotes: IncidentNotes[]
  arrival: { tank: string; at: number; speciesKey: string; count: number; source: string; notes: string; by: string }
  photos: Array<{ tank: string; at: number; caption: string; by: string }>
}

/** Who does the work on a day: the day keeper on weekdays, the other keeper at weekends (as the roster has it). */
const workerOn = (day: LocalDate) => (weekdayOf(day) < 5 ? KEEPER_DAYS : KEEPER_NIGHTS)

function careFor(tank: StoryTank, index: number, firstDay: LocalDate, now: number): CareDone[] {
  const done: CareDone[] = []
  for (const task of defaultCareTasksFor(tank)) {
    if (task.recurrence.kind !== 'interval') continue
    let due = firstDay
    for (let occurrence = 0; ; occurrence++) {
      const late = PLANNED_LATE.find((l) => l.tank === tank.name && l.kind === task.kind && l.occurrence === occurrence)
      const day = addDays(due, late?.daysLate ?? 0)
      const at = localToInstant(tank.timeZone, day, WORK_MINUTES[task.kind] + index * 12)
      if (at >= now - HOUR_MS) break
      done.push({ tank: tank.name, kind: task.kind, at, daysLate: late?.daysLate ?? 0, by: workerOn(day) })
      due = addDays(day, task.recurrence.everyDays)
    }
  }
  return done
}

/** Weekly kit results: an established tank reads clean, nitrate creeping up between changes; a cycling one shows the cycle. */
function kitValues(tank: StoryTank, week: number, random: () => number): { values: KitValue[]; notes: string } {
  const r = (base: number, spread: number, places = 1) => Math.round((base + (random() - 0.5) * spread) * 10 ** places) / 10 ** places
  const salt = tank.kind === 'marine' || tank.kind === 'brackish'
  const phBase = { tropical_freshwater: 7.2, planted: 6.9, coldwater: 7.4, brackish: 7.9, marine: 8.2 }[tank.kind]
  if (tank.stage === 'cycling') {
    const cycle = [
      { ammonia: 2, nitrite: 0.25, nitrate: 2, notes: 'Fishless cycle: ammonia dosed to 2 mg/L, nitrite just showing.' },
      { ammonia: 1, nitrite: 1.5, nitrate: 5, notes: 'Ammonia falling, nitrite up: the second stage of the cycle.' },
      { ammonia: 0.25, nitrite: 2, nitrate: 10, notes: 'Nitrite peaking; keep dosing ammonia, no fish yet.' },
      { ammonia: 0.25, nitrite: 0.5, nitrate: 20, notes: 'Nitrite coming down; nitrate rising.' },
      { ammonia: 0, nitrite: 0.1, nitrate: 25, notes: 'Nearly there: ammonia gone within a day of dosing.' },
    ][Math.min(week, 4)]!
    return {
      values: [
        { metric: 'ammonia', value: cycle.ammonia, unit: 'mg/L' },
        { metric: 'nitrite', value: cycle.nitrite, unit: 'mg/L' },
        { metric: 'nitrate', value: cycle.nitrate, unit: 'mg/L' },
        { metric: 'ph', value: r(phBase, 0.2), unit: 'pH' },
      ],
      notes: cycle.notes,
    }
  }
  const values: KitValue[] = [
    { metric: 'ammonia', value: 0, unit: 'mg/L' },
    { metric: 'nitrite', value: 0, unit: 'mg/L' },
    { metric: 'nitrate', value: tank.kind === 'marine' ? r(5, 3) : r(15, 8, 0), unit: 'mg/L' },
    { metric: 'ph', value: r(phBase, 0.2), unit: 'pH' },
  ]
  if (salt) values.push({ metric: 'kh', value: r(tank.kind === 'marine' ? 8.5 : 10, 1), unit: 'dKH' })
  // Reef chemistry read off kits, steady by the week; no random draws, so every other value stays as it was.
  if (tank.kind === 'marine') {
    values.push(
      { metric: 'salinity', value: [34.8, 35.0, 35.2, 34.9, 35.1][week % 5]!, unit: 'ppt' },
      { metric: 'calcium', value: [420, 430, 410, 425, 415][week % 5]!, unit: 'mg/L' },
      { metric: 'magnesium', value: [1320, 1340, 1300, 1330, 1310][week % 5]!, unit: 'mg/L' },
      { metric: 'phosphate', value: [0.04, 0.05, 0.06, 0.05, 0.04][week % 5]!, unit: 'mg/L' },
    )
  }
  if (tank.kind === 'brackish') values.push({ metric: 'specific_gravity', value: [1.0085, 1.009, 1.0095, 1.009, 1.0085][week % 5]!, unit: 'SG25' })
  return { values, notes: week % 2 ? 'All clear.' : '' }
}

export function demoStory(tanks: readonly StoryTank[], now: number, seed = 1): DemoStory {
  const zone = tanks[0]?.timeZone ?? 'UTC'
  // From local midnight thirty days back, so the first day's morning work is on record too.
  const firstDay = addDays(localDateAt(zone, now), -HISTORY_DAYS)
  const fromMs = localToInstant(zone, firstDay, 0)
  const lastWeek = lastEndedPeriod('week', now, zone)
  const dayOfLastWeek = (days: number, minutes: number) => localToInstant(zone, addDays(localDateAt(zone, lastWeek.from + 12 * HOUR_MS), days), minutes)
  const live = tanks.filter((t) => t.stage !== 'empty')

  const care = live.flatMap((tank, index) => careFor(tank, index, firstDay, now))
  const episodes = new Map<string, Episode[]>(live.map((t) => [t.name, []]))
  for (const c of care) {
    if (c.kind === 'water_change') episodes.get(c.tank)!.push({ kind: 'water_change', fromMs: c.at, percent: WATER_CHANGE_PERCENT })
  }
  // The faults of the month: two last week, one the week before, and one two days ago (the
  // incidents list opens on the last seven days).
  const stuckFrom = dayOfLastWeek(2, 30)
  episodes.get('Breeding cylinder C1')?.push({ kind: 'heater_stuck_on', fromMs: stuckFrom, toMs: stuckFrom + 4.5 * HOUR_MS })
  const quietFrom = dayOfLastWeek(4, 14 * 60)
  episodes.get('Brackish B1')?.push({ kind: 'sensor_quiet', fromMs: quietFrom, toMs: quietFrom + 50 * MINUTE_MS })
  const recentQuietFrom = localToInstant(zone, addDays(localDateAt(zone, now), -2), 16 * 60 + 10)
  episodes.get('Reef display')?.push({ kind: 'sensor_quiet', fromMs: recentQuietFrom, toMs: recentQuietFrom + 26 * MINUTE_MS })
  const failedFrom = dayOfLastWeek(-4, 22 * 60)
  const replacedAt = failedFrom + 11 * HOUR_MS
  episodes.get('Display 1 — community')?.push({ kind: 'heater_failed', fromMs: failedFrom, toMs: replacedAt })

  const incidentNotes: IncidentNotes[] = [
    {
      tank: 'Breeding cylinder C1',
      episode: 'heater_stuck_on',
      ackAfterMs: 22 * MINUTE_MS,
      ackNote:
        'Heater stuck on, element glowing with the water at 28 °C. Unplugged it at the wall before touching the tank, lid off and a fan on the surface. Spare heater goes in after it has cooled.',
    },
    {
      tank: 'Brackish B1',
      episode: 'sensor_quiet',
      ackAfterMs: 6 * MINUTE_MS,
      ackNote: 'Node unplugged while the canister was serviced; plugging it back in.',
    },
    {
      tank: 'Reef display',
      episode: 'sensor_quiet',
      ackAfterMs: 4 * MINUTE_MS,
      ackNote: 'Node’s plug knocked out of the power strip during feeding; back in, readings should resume.',
    },
    {
      tank: 'Display 1 — community',
      episode: 'heater_failed',
      ackAfterMs: 8 * MINUTE_MS,
      ackNote: 'Heater cold, indicator off. Lid closed and a blanket over the back; a new 300 W heater goes in when the shop opens.',
      resolveByHand: {
        at: replacedAt + 75 * MINUTE_MS,
        note: 'Old heater unplugged and taken out; new 300 W heater in at 26 °C after 15 minutes in the water switched off. Temperature climbing again; old heater bagged for return.',
      },
    },
  ]

  const random = mulberry32(seedFrom(seed, 'kits'))
  const testKits: TestKitPlan[] = care
    .filter((c) => c.kind === 'test_kit_check')
    .map((c) => {
      const tank = live.find((t) => t.name === c.tank)!
      const week = Math.floor((c.at - fromMs) / (7 * DAY_MS))
      return { tank: c.tank, at: c.at - 5 * MINUTE_MS, by: c.by, ...kitValues(tank, week, random) }
    })

  const arrivalDay = addDays(localDateAt(zone, now), -2)
  const arrival = {
    tank: 'Quarantine Q1',
    at: localToInstant(zone, arrivalDay, 11 * 60),
    speciesKey: 'harlequin_rasbora',
    count: 15,
    source: 'Weekly wholesaler delivery (invented)',
    notes: 'Bagged 5 h; drip-acclimated over 45 minutes. Two thin, watching them.',
    by: workerOn(arrivalDay),
  }
  const photoAt = (daysAgo: number, minutes: number) => localToInstant(zone, addDays(localDateAt(zone, now), -daysAgo), minutes)
  const photos = [
    { tank: 'Display 1 — community', at: photoAt(20, 16 * 60), caption: 'After the glass clean: school settled in the midground' },
    { tank: 'Display 2 — planted scape', at: photoAt(17, 15 * 60), caption: 'Carpet filling in after the trim' },
    { tank: 'Display 2 — planted scape', at: photoAt(3, 15 * 60), caption: 'Two weeks on: stem plants need a trim' },
    { tank: 'Reef display', at: photoAt(11, 17 * 60), caption: 'Full lights, corals open' },
    { tank: 'Quarantine Q1', at: arrival.at + 2 * HOUR_MS, caption: 'New arrivals, settling in quarantine' },
  ].map((p) => ({ ...p, by: workerOn(localDateAt(zone, p.at)) }))

  return { fromMs, toMs: now, episodes, care, testKits, incidentNotes, arrival, photos }
}
