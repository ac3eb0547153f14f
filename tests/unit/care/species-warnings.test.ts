import { describe, expect, it } from 'vitest'
import { quarantineStatus, stockingWarnings, watchUntil } from '@shared/care/livestock'
import { SPECIES, speciesByKey } from '@shared/care/species'

// The species ranges are `from memory` (see shared/care/species.ts); these tests check the
// table's shape and how warnings follow from it, not the ranges themselves. The 3-day watch
// and the 28-day quarantine are `common practice`.
const tropical = { kind: 'tropical_freshwater', stage: 'established', targets: { temperature: { min: 24, max: 26 }, ph: { min: 6.5, max: 7 } } }
const codes = (...args: Parameters<typeof stockingWarnings>) => stockingWarnings(...args).map((w) => w.code)

describe('species table', () => {
  it('holds about fifteen entries, each marked from memory, with sane ranges', () => {
    expect(SPECIES.length).toBeGreaterThanOrEqual(15)
    expect(new Set(SPECIES.map((s) => s.key)).size).toBe(SPECIES.length)
    for (const s of SPECIES) {
      expect(s.basis).toBe('from memory')
      expect(s.scientificName).toMatch(/^[A-Z][a-z]+ [a-z]+$/)
      expect(s.temperatureC.min).toBeLessThan(s.temperatureC.max)
      expect(s.ph.min).toBeLessThan(s.ph.max)
      expect(s.temperatureC.min).toBeGreaterThanOrEqual(0)
      expect(s.temperatureC.max).toBeLessThanOrEqual(35)
      expect(s.ph.min).toBeGreaterThanOrEqual(4)
      expect(s.ph.max).toBeLessThanOrEqual(9)
    }
    expect(SPECIES.some((s) => s.category === 'plant')).toBe(true)
  })
})

describe('stocking warnings', () => {
  it('has nothing to say about neon tetras in a 24–26 °C, pH 6.5–7 tank', () => {
    expect(stockingWarnings(tropical, speciesByKey('neon_tetra'), 'fish')).toEqual([])
  })

  it('flags a target band reaching outside the species range, naming both', () => {
    const warnings = stockingWarnings(tropical, speciesByKey('goldfish'), 'fish')
    expect(warnings).toEqual([
      { code: 'temperature_outside_range', message: "The tank's target 24–26 °C reaches outside the usual 10–24 °C for Goldfish" },
      { code: 'ph_outside_range', message: "The tank's target pH 6.5–7 reaches outside the usual pH 7–8 for Goldfish" },
    ])
  })

  it('flags marine fish in fresh water and fresh fish in a marine tank, not in brackish', () => {
    expect(codes(tropical, speciesByKey('ocellaris_clownfish'), 'fish')).toContain('water_type')
    const marine = { kind: 'marine', stage: 'established', targets: {} }
    expect(codes(marine, speciesByKey('guppy'), 'fish')).toEqual(['water_type'])
    expect(codes({ ...marine, kind: 'brackish' }, speciesByKey('guppy'), 'fish')).toEqual([])
  })

  it('warns about animals, not plants, going into a cycling tank', () => {
    const cycling = { ...tropical, stage: 'cycling' }
    expect(codes(cycling, speciesByKey('neon_tetra'), 'fish')).toEqual(['tank_cycling'])
    expect(codes(cycling, undefined, 'invertebrate')).toEqual(['tank_cycling'])
    expect(codes(cycling, speciesByKey('java_fern'), 'plant')).toEqual([])
  })
})

describe('watch period and quarantine', () => {
  it('watches new arrivals for 3 days', () => {
    expect(watchUntil(new Date('2026-05-01T10:00:00Z')).toISOString()).toBe('2026-05-04T10:00:00.000Z')
  })

  it('counts 28 quarantine days from the start, rounding part days up', () => {
    const start = new Date('2026-05-01T10:00:00Z')
    expect(quarantineStatus(start, new Date('2026-05-11T10:00:00Z'))).toEqual({
      startedAt: '2026-05-01T10:00:00.000Z',
      endsAt: '2026-05-29T10:00:00.000Z',
      daysIn: 10,
      daysRemaining: 18,
      days: 28,
    })
    expect(quarantineStatus(start, new Date('2026-05-11T12:00:00Z'))).toMatchObject({ daysIn: 10, daysRemaining: 18 })
    expect(quarantineStatus(start, new Date('2026-05-01T10:01:00Z'))).toMatchObject({ daysIn: 0, daysRemaining: 28 })
    expect(quarantineStatus(start, new Date('2026-06-02T10:00:00Z')).daysRemaining).toBe(0)
    expect(quarantineStatus(null, new Date())).toMatchObject({ daysIn: null, daysRemaining: null })
  })
})
