// A stocking plan checked against the tank: bands, volume, group sizes, livebearers, stages.
// The hints below are keepers' usual figures, `from memory` (adult length, smallest tank,
// smallest group); the checks built on them are common practice, a prompt rather than a rule.
import { stockingWarnings, type StockingWarning } from '../care/livestock'
import { speciesByKey } from '../care/species'

export interface StockingHint {
  adultCm: number
  minTankLitres: number
  minGroup: number
  livebearer: boolean
  basis: 'from memory'
}

const hint = (adultCm: number, minTankLitres: number, minGroup: number, livebearer = false): StockingHint => ({
  adultCm,
  minTankLitres,
  minGroup,
  livebearer,
  basis: 'from memory',
})

export const STOCKING_HINTS: Readonly<Record<string, StockingHint>> = {
  neon_tetra: hint(3.5, 54, 6),
  cardinal_tetra: hint(4, 60, 6),
  guppy: hint(5, 40, 3, true),
  platy: hint(6, 54, 3, true),
  zebra_danio: hint(5, 54, 6),
  bronze_corydoras: hint(6.5, 54, 6),
  betta: hint(6.5, 20, 1),
  angelfish: hint(15, 150, 1),
  goldfish: hint(20, 200, 1),
  white_cloud: hint(4, 40, 6),
  harlequin_rasbora: hint(4.5, 54, 6),
  ocellaris_clownfish: hint(8, 75, 1),
  cherry_shrimp: hint(3, 10, 6),
}

/** common practice: about 1 cm of adult fish per litre of water, for small community fish. */
export const CM_OF_FISH_PER_LITRE = 1
/** common practice: below about 100 L, livebearers are kept all male, or one male to two or three females. */
export const SMALL_TANK_LIVEBEARER_LITRES = 100

export type StockingCheckCode = StockingWarning['code'] | 'unknown_species' | 'tank_too_small' | 'group_too_small' | 'livebearer_sexes' | 'overstocked'

export interface StockingCheck {
  code: StockingCheckCode
  message: string
  speciesKey?: string
}

export interface StockingTankFacts {
  kind: string
  /** The tank's own volume (to the rim): the figure smallest-tank advice is given in. */
  tankLitres: number
  /** Open water after substrate and hardscape: what the animals live in. */
  waterLitres: number
  targets: { temperature?: { min: number; max: number }; ph?: { min: number; max: number } }
}

export interface PlannedGroup {
  speciesKey: string
  count: number
}

/** The bioload of the whole plan: adult centimetres of animals over litres of water. */
export function stockingLoad(groups: readonly PlannedGroup[], waterLitres: number) {
  const adultCm = groups.reduce((t, g) => t + (STOCKING_HINTS[g.speciesKey]?.adultCm ?? 0) * g.count, 0)
  return { adultCm, capacityCm: waterLitres * CM_OF_FISH_PER_LITRE, share: adultCm / (waterLitres * CM_OF_FISH_PER_LITRE) }
}

export function checkStockingPlan(tank: StockingTankFacts, groups: readonly PlannedGroup[]): StockingCheck[] {
  const checks: StockingCheck[] = []
  for (const group of groups) {
    const species = speciesByKey(group.speciesKey)
    if (!species) {
      checks.push({ code: 'unknown_species', message: `${group.speciesKey} is not in the species table`, speciesKey: group.speciesKey })
      continue
    }
    // The stage is judged on the day of stocking, after cycling: only the bands and water type here.
    for (const w of stockingWarnings({ kind: tank.kind, stage: 'established', targets: tank.targets }, species, species.category)) {
      checks.push({ ...w, speciesKey: species.key })
    }
    const h = STOCKING_HINTS[species.key]
    if (!h) continue
    const name = species.commonName
    if (tank.tankLitres < h.minTankLitres) {
      checks.push({
        code: 'tank_too_small',
        message: `${name} usually needs a tank of at least ${h.minTankLitres} L; this one is about ${Math.round(tank.tankLitres)} L`,
        speciesKey: species.key,
      })
    }
    if (group.count < h.minGroup) {
      checks.push({ code: 'group_too_small', message: `${name} is kept in groups of ${h.minGroup} or more`, speciesKey: species.key })
    }
    if (h.livebearer && tank.tankLitres < SMALL_TANK_LIVEBEARER_LITRES) {
      checks.push({
        code: 'livebearer_sexes',
        message: `${name} in a tank under ${SMALL_TANK_LIVEBEARER_LITRES} L: keep males only, or one male to two or three females, or fry will soon crowd it (common practice)`,
        speciesKey: species.key,
      })
    }
  }
  const load = stockingLoad(groups, tank.waterLitres)
  if (load.share > 1) {
    checks.push({
      code: 'overstocked',
      message: `${Math.round(load.adultCm)} cm of adult animals for about ${Math.round(tank.waterLitres)} L: more than ${CM_OF_FISH_PER_LITRE} cm per litre (common practice)`,
    })
  }
  return checks
}

export interface LivestockBands {
  temperature: { min: number; max: number } | null
  ph: { min: number; max: number } | null
  /** Species whose bands do not overlap the rest: no one target suits them all. */
  conflict: boolean
}

/** The bands every planned species shares (the overlap of their usual ranges). */
export function livestockBands(groups: readonly PlannedGroup[]): LivestockBands {
  const species = groups.map((g) => speciesByKey(g.speciesKey)).filter((s) => s !== undefined)
  if (!species.length) return { temperature: null, ph: null, conflict: false }
  const overlap = (pick: (s: (typeof species)[number]) => { min: number; max: number }) => ({
    min: Math.max(...species.map((s) => pick(s).min)),
    max: Math.min(...species.map((s) => pick(s).max)),
  })
  const temperature = overlap((s) => s.temperatureC)
  const ph = overlap((s) => s.ph)
  const conflict = temperature.min > temperature.max || ph.min > ph.max
  return { temperature: temperature.min <= temperature.max ? temperature : null, ph: ph.min <= ph.max ? ph : null, conflict }
}
