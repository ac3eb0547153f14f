import { describe, expect, it } from 'vitest'
import { readPlan } from '../../server/readings/series'

const ms = (iso: string) => Date.parse(iso)
const HOUR = 3600
const DAY = 24 * HOUR
const NONE = [0, 0]
const spans = (plan: ReturnType<typeof readPlan>) => ({
  raw: plan.raw.map(([a, b]) => (a < b ? [new Date(a).toISOString(), new Date(b).toISOString()] : null)),
  hourly: plan.hourly.map(([a, b]) => (a < b ? [new Date(a).toISOString(), new Date(b).toISOString()] : null)),
  daily: plan.daily[0] < plan.daily[1] ? [new Date(plan.daily[0]).toISOString(), new Date(plan.daily[1]).toISOString()] : null,
})

// Rolled up before 20 Nov 10:00, raw rows kept from 1 Nov 00:00 on.
const state = { rolledUpBefore: ms('2026-11-20T10:00:00Z'), rawKeptFrom: ms('2026-11-01T00:00:00Z') }

describe('readPlan', () => {
  it('reads raw rows only for steps shorter than an hour', () => {
    const plan = readPlan(ms('2026-11-10T00:00:00Z'), ms('2026-11-17T00:00:00Z'), 900, state)
    expect(plan).toEqual({ raw: [[ms('2026-11-10T00:00:00Z'), ms('2026-11-17T00:00:00Z')], NONE], hourly: [NONE, NONE], daily: NONE })
  })

  it('reads whole days inside, hours around them, raw minutes at the edges and after the last rolled-up hour', () => {
    const plan = readPlan(ms('2026-11-05T13:20:00Z'), ms('2026-11-20T12:34:00Z'), DAY, state)
    expect(spans(plan)).toEqual({
      raw: [
        ['2026-11-05T13:20:00.000Z', '2026-11-05T14:00:00.000Z'],
        ['2026-11-20T10:00:00.000Z', '2026-11-20T12:34:00.000Z'],
      ],
      hourly: [
        ['2026-11-05T14:00:00.000Z', '2026-11-06T00:00:00.000Z'],
        ['2026-11-20T00:00:00.000Z', '2026-11-20T10:00:00.000Z'],
      ],
      daily: ['2026-11-06T00:00:00.000Z', '2026-11-20T00:00:00.000Z'],
    })
  })

  it('uses hours, not days, for steps of whole hours that are not whole days', () => {
    const plan = readPlan(ms('2026-11-05T13:20:00Z'), ms('2026-11-19T12:34:00Z'), 12 * HOUR, state)
    expect(spans(plan)).toEqual({
      raw: [
        ['2026-11-05T13:20:00.000Z', '2026-11-05T14:00:00.000Z'],
        ['2026-11-19T12:00:00.000Z', '2026-11-19T12:34:00.000Z'],
      ],
      hourly: [['2026-11-05T14:00:00.000Z', '2026-11-19T12:00:00.000Z'], null],
      daily: null,
    })
  })

  it('counts an edge hour whole where its raw rows are gone', () => {
    const plan = readPlan(ms('2026-10-10T13:20:00Z'), ms('2026-10-12T05:10:00Z'), HOUR, state)
    expect(spans(plan)).toEqual({
      raw: [null, null],
      hourly: [['2026-10-10T13:00:00.000Z', '2026-10-12T06:00:00.000Z'], null],
      daily: null,
    })
  })

  it('reads a range reaching from before the raw window to now from days, hours and raw rows', () => {
    const plan = readPlan(ms('2026-10-10T13:20:00Z'), ms('2026-11-20T11:00:00Z'), 7 * DAY, state)
    expect(spans(plan)).toEqual({
      raw: [null, ['2026-11-20T10:00:00.000Z', '2026-11-20T11:00:00.000Z']],
      hourly: [
        ['2026-10-10T13:00:00.000Z', '2026-10-11T00:00:00.000Z'],
        ['2026-11-20T00:00:00.000Z', '2026-11-20T10:00:00.000Z'],
      ],
      daily: ['2026-10-11T00:00:00.000Z', '2026-11-20T00:00:00.000Z'],
    })
  })

  it('reads raw rows when the range lies after the last rolled-up hour or inside one kept hour', () => {
    expect(spans(readPlan(ms('2026-11-20T10:30:00Z'), ms('2026-11-20T12:00:00Z'), HOUR, state)).raw[0]).toEqual([
      '2026-11-20T10:30:00.000Z',
      '2026-11-20T12:00:00.000Z',
    ])
    expect(spans(readPlan(ms('2026-11-10T10:05:00Z'), ms('2026-11-10T10:55:00Z'), HOUR, state))).toEqual({
      raw: [['2026-11-10T10:05:00.000Z', '2026-11-10T10:55:00.000Z'], null],
      hourly: [null, null],
      daily: null,
    })
  })
})
