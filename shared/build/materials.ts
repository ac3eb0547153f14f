// Densities the build computations use. None of them is from a checked table: each is marked
// `from memory` (a keeper's or builder's usual figure). Product bags and data sheets rule.

export interface SubstrateMaterial {
  key: string
  label: string
  /** Dry bulk density as poured, kg per litre. */
  bulkDensityKgPerL: number
  basis: 'from memory'
}

export const SUBSTRATE_MATERIALS: readonly SubstrateMaterial[] = [
  { key: 'mineral_base', label: 'Mineral base layer', bulkDensityKgPerL: 1.2, basis: 'from memory' },
  { key: 'nutrient_soil', label: 'Nutrient soil (baked clay granules)', bulkDensityKgPerL: 0.9, basis: 'from memory' },
  { key: 'sand', label: 'Sand', bulkDensityKgPerL: 1.6, basis: 'from memory' },
  { key: 'gravel', label: 'Gravel', bulkDensityKgPerL: 1.6, basis: 'from memory' },
]
export const SUBSTRATE_KEYS = SUBSTRATE_MATERIALS.map((m) => m.key)

export function substrateMaterial(key: string): SubstrateMaterial | undefined {
  return SUBSTRATE_MATERIALS.find((m) => m.key === key)
}

/** from memory: share of a wet granular bed that is water (loose sand and gravel are ~0.35–0.45). */
export const SUBSTRATE_POROSITY = 0.4

/** from memory: rock as solid stone (granite, limestone, slate run 2.5–2.8 kg/L). */
export const ROCK_DENSITY_KG_PER_L = 2.6
/** from memory: waterlogged hardwood sits near water's density; sunk wood is a little heavier. */
export const WOOD_DENSITY_KG_PER_L = 1.1
export const HARDSCAPE_DENSITY_KG_PER_L = { rock: ROCK_DENSITY_KG_PER_L, wood: WOOD_DENSITY_KG_PER_L } as const
export type HardscapeKind = keyof typeof HARDSCAPE_DENSITY_KG_PER_L

/** from memory: soda-lime float glass is about 2.5 g/cm³ (2.5 kg per litre of glass). */
export const GLASS_DENSITY_KG_PER_L = 2.5
