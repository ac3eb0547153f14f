import { describe, expect, it } from 'vitest'
import { buildDay, buildFigures, buildTimeline, checkStockingPlan, livestockBands, phSteps, redateStocking, zeroOnConsecutiveTests } from '@shared/build'
import { expectWithin } from '../chemistry/helpers'

describe('pH brought gradually (common practice: at most 0.2 a day)', () => {
  it('steps down into the band and stops at its edge', () => {
    expect(phSteps(7.6, { min: 6.8, max: 7.2 })).toEqual([7.4, 7.2])
    expect(phSteps(7.61, { min: 6.8, max: 7.2 })).toEqual([7.41, 7.21, 7.2])
    expect(phSteps(6.5, { min: 6.8, max: 7.2 }, 0.1)).toEqual([6.6, 6.7, 6.8])
    expect(phSteps(7, { min: 6.8, max: 7.2 })).toEqual([])
    expect(() => phSteps(7.6, { min: 6.8, max: 7.2 }, 0)).toThrow(/maxChangePerDay/)
  })
})

describe('build timeline from the fill day', () => {
  const timeline = buildTimeline({
    filledOn: '2026-12-01',
    setPointC: 26,
    ph: { start: 7.6, min: 6.8, max: 7.2 },
    plants: true,
    stages: [{ label: '8 × Harlequin rasbora', settleDays: 14 }, { label: '6 × Bronze corydoras' }],
  })

  it('dates each step; stocking waits for cycling (about 28 days, common practice) and rooting (21 days)', () => {
    const byKey = Object.fromEntries(timeline.steps.map((s) => [s.key, s]))
    expect(timeline.steps.map((s) => s.key)).toEqual(['conditioner', 'heater_check', 'ph', 'plants', 'cycling', 'stock_1', 'stock_2'])
    expect(byKey.conditioner).toMatchObject({ day: 1, dueOn: '2026-12-01', daily: false })
    expect(byKey.heater_check).toMatchObject({ day: 2, dueOn: '2026-12-02' })
    expect(byKey.heater_check!.title).toContain('26 °C')
    // Two daily steps of 0.2: days 2 and 3.
    expect(byKey.ph).toMatchObject({ day: 2, untilDay: 3, daily: true })
    expect(byKey.ph!.title).toContain('7.4 → 7.2')
    expect(byKey.plants).toMatchObject({ day: 3, dueOn: '2026-12-03' })
    expect(byKey.cycling).toMatchObject({ day: 3, untilDay: 27, daily: true })
    // Day 28 is 27 days after 1 December; the second stage settles 14 days later (day 42).
    expect(byKey.stock_1).toMatchObject({ day: 28, dueOn: '2026-12-28' })
    expect(byKey.stock_2).toMatchObject({ day: 42, dueOn: '2027-01-11' })
    expect(timeline.aboutDays).toBe(28)
  })

  it('counts build days from the fill day as day 1', () => {
    expect(buildDay('2026-12-01', '2026-12-01')).toBe(1)
    expect(buildDay('2026-12-01', '2026-12-09')).toBe(9)
    expect(buildDay('2026-12-28', '2027-01-02')).toBe(6)
  })

  it('tests pH once when it starts in the band or is unknown', () => {
    const t = buildTimeline({ filledOn: '2026-12-01', setPointC: 26, ph: { start: null, min: 6.5, max: 7.5 }, plants: false, stages: [] })
    expect(t.steps.find((s) => s.key === 'ph')).toMatchObject({ daily: false, title: 'Test pH against the target 6.5–7.5' })
    expect(t.steps.some((s) => s.key === 'plants')).toBe(false)
  })
})

describe('cycling ends on consecutive zero tests (common practice: two in a row)', () => {
  const day = 86_400_000
  it('needs the last two tests of ammonia and nitrite at kit zero', () => {
    const ok = [
      { at: 1 * day, ammonia: 1, nitrite: 2 },
      { at: 2 * day, ammonia: 0, nitrite: 0.05 },
      { at: 3 * day, ammonia: 0.02, nitrite: 0 },
    ]
    expect(zeroOnConsecutiveTests(ok)).toBe(true)
    expect(zeroOnConsecutiveTests([...ok, { at: 4 * day, ammonia: 0, nitrite: 0.1 }])).toBe(false)
    expect(zeroOnConsecutiveTests([{ at: day, ammonia: 0, nitrite: 0 }])).toBe(false)
    // A test of ammonia alone does not count towards the pair.
    expect(
      zeroOnConsecutiveTests([
        { at: day, ammonia: 0, nitrite: 0 },
        { at: 2 * day, ammonia: 0 },
      ]),
    ).toBe(false)
  })
})

describe('stocking plan checks (hints from memory, checks common practice)', () => {
  const tank = { kind: 'planted', tankLitres: 50, waterLitres: 47.5, targets: { temperature: { min: 24, max: 26 }, ph: { min: 6.8, max: 7.2 } } }

  it('flags small tanks, small groups, livebearers in small tanks, and bands', () => {
    const checks = checkStockingPlan(tank, [
      { speciesKey: 'neon_tetra', count: 8 },
      { speciesKey: 'guppy', count: 3 },
      { speciesKey: 'harlequin_rasbora', count: 4 },
    ])
    const codes = checks.map((c) => `${c.speciesKey}:${c.code}`)
    expect(codes).toEqual([
      'neon_tetra:tank_too_small',
      'guppy:ph_outside_range',
      'guppy:livebearer_sexes',
      'harlequin_rasbora:tank_too_small',
      'harlequin_rasbora:group_too_small',
      'undefined:overstocked',
    ])
    expect(checks[0]!.message).toBe('Neon tetra usually needs a tank of at least 54 L; this one is about 50 L')
    // 8 × 3.5 + 3 × 5 + 4 × 4.5 = 61 cm of adult fish for 47.5 L.
    expect(checks[5]!.message).toContain('61 cm of adult animals for about 48 L')
  })

  it('flags more than 1 cm of adult fish per litre', () => {
    // 12 bronze corydoras × 6.5 cm = 78 cm > 47.5 cm of capacity.
    const checks = checkStockingPlan(tank, [{ speciesKey: 'bronze_corydoras', count: 12 }])
    expect(checks.map((c) => c.code)).toEqual(['tank_too_small', 'overstocked'])
    expect(checks[1]!.message).toContain('78 cm of adult animals for about 48 L')
  })

  it('takes the overlap of the planned species bands as the target', () => {
    // Neon 20–26 °C, pH 6–7.5; bronze corydoras 22–28 °C, pH 6–8 (species table, from memory).
    expect(
      livestockBands([
        { speciesKey: 'neon_tetra', count: 8 },
        { speciesKey: 'bronze_corydoras', count: 6 },
      ]),
    ).toEqual({
      temperature: { min: 22, max: 26 },
      ph: { min: 6, max: 7.5 },
      conflict: false,
    })
    // Goldfish (10–24 °C), White Cloud (14–22 °C) and angelfish (24–30 °C) share no temperature.
    expect(
      livestockBands([
        { speciesKey: 'goldfish', count: 1 },
        { speciesKey: 'white_cloud', count: 6 },
        { speciesKey: 'angelfish', count: 1 },
      ]).conflict,
    ).toBe(true)
  })
})

describe('all figures of one plan', () => {
  it('connects the substrate depth to the water left, the weight, the heater and the dose', () => {
    const figures = buildFigures({
      shape: { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 },
      kind: 'planted',
      fillHeightCm: 34,
      glassThicknessMm: 6,
      roomC: 20,
      setPointC: 26,
      substrate: [
        { material: 'mineral_base', depthCm: 1 },
        { material: 'nutrient_soil', depthCm: 4, bagLitres: 3 },
        { material: 'gravel', depthCm: 1, bagLitres: 2 },
      ],
      hardscape: [
        { kind: 'rock', kg: 5 },
        { kind: 'wood', litres: 1 },
      ],
      labelRate: { amount: 5, unit: 'mL', per: '10L' },
      targets: {},
      groups: [],
    })
    // Same worked example as the separate tests above.
    expectWithin(figures.waterLitres, 47.47692, 1e-5)
    expectWithin(figures.weight.totalKg, 81.684, 1e-2)
    expect(figures.heater.watts).toBe(75)
    expectWithin(figures.heater.topMaxCm, 20, 1e-9)
    expect(figures.heater.minTopCm).toBe(6)
    expectWithin(figures.conditioner!.amount, 23.7385, 1e-4)
    expect(figures.cautions.weight.join(' ')).toMatch(/structural engineer/)
    expect(figures.cautions.electrical.join(' ')).toMatch(/RCD\/GFCI/)
  })
})

describe('stocking re-dated from what happened', () => {
  it('waits for cycling that ends late, keeps the plan when it ends early', () => {
    // Planned stages on days 28 and 42; cycled on day 34 → first stage day 35, second 49.
    expect(redateStocking([28, 42], [14], { kind: 'cycled', day: 34 })).toEqual([35, 49])
    expect(redateStocking([28, 42], [14], { kind: 'cycled', day: 20 })).toEqual([28, 42])
  })

  it('dates later stages from the day a stage actually went in', () => {
    // Stage 1 in on day 30; stage 2 settles 14 days (common practice), stage 3 after 10 more.
    expect(redateStocking([28, 42, 52], [14, 10], { kind: 'stocked', stage: 1, day: 30 })).toEqual([30, 44, 54])
    expect(redateStocking([28, 42, 52], [14, 10], { kind: 'stocked', stage: 3, day: 55 })).toEqual([28, 42, 55])
    expect(redateStocking([], [], { kind: 'cycled', day: 9 })).toEqual([])
  })
})
