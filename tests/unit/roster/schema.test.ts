import { expect, it } from 'vitest'
import { rosterOverrideSchema, weeklyShiftSchema } from '@shared/roster'

it('accepts a weekly shift and rejects a bad weekday or clock time', () => {
  expect(weeklyShiftSchema.safeParse({ userId: '7', weekday: 6, start: '22:00', end: '06:00' }).success).toBe(true)
  expect(weeklyShiftSchema.safeParse({ userId: '7', weekday: 7, start: '22:00', end: '06:00' }).success).toBe(false)
  expect(weeklyShiftSchema.safeParse({ userId: '7', weekday: 0, start: '24:00', end: '06:00' }).success).toBe(false)
})

it('requires an offset on override instants and an end after the start', () => {
  const base = { userId: '7', kind: 'remove' as const }
  expect(rosterOverrideSchema.safeParse({ ...base, startsAt: '2026-01-05T08:00:00+01:00', endsAt: '2026-01-05T12:00:00Z' }).success).toBe(true)
  expect(rosterOverrideSchema.safeParse({ ...base, startsAt: '2026-01-05T08:00:00', endsAt: '2026-01-05T12:00:00' }).success).toBe(false)
  const backwards = rosterOverrideSchema.safeParse({ ...base, startsAt: '2026-01-05T12:00:00Z', endsAt: '2026-01-05T08:00:00Z' })
  expect(backwards.error?.issues.map((issue) => issue.path.join('.'))).toEqual(['endsAt'])
})
