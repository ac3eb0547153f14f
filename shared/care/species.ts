// A small reference table of common aquarium animals and plants, written for this product.
// Every range below is `from memory` (keepers' usual figures, not checked against a published
// source), rounded to whole degrees and half pH units on purpose: it is a prompt to look
// closer, not a care sheet.

export type SpeciesCategory = 'fish' | 'invertebrate' | 'plant'
export type SpeciesWater = 'fresh' | 'marine'

export interface Species {
  key: string
  commonName: string
  scientificName: string
  category: SpeciesCategory
  water: SpeciesWater
  temperatureC: { min: number; max: number }
  ph: { min: number; max: number }
  basis: 'from memory'
}

const entry = (
  key: string,
  commonName: string,
  scientificName: string,
  category: SpeciesCategory,
  water: SpeciesWater,
  temperatureC: [number, number],
  ph: [number, number],
): Species => ({
  key,
  commonName,
  scientificName,
  category,
  water,
  temperatureC: { min: temperatureC[0], max: temperatureC[1] },
  ph: { min: ph[0], max: ph[1] },
  basis: 'from memory',
})

export const SPECIES: readonly Species[] = [
  entry('neon_tetra', 'Neon tetra', 'Paracheirodon innesi', 'fish', 'fresh', [20, 26], [6, 7.5]), // from memory
  entry('cardinal_tetra', 'Cardinal tetra', 'Paracheirodon axelrodi', 'fish', 'fresh', [23, 29], [5, 7]), // from memory
  entry('guppy', 'Guppy', 'Poecilia reticulata', 'fish', 'fresh', [22, 28], [7, 8]), // from memory
  entry('platy', 'Southern platyfish', 'Xiphophorus maculatus', 'fish', 'fresh', [20, 26], [7, 8]), // from memory
  entry('zebra_danio', 'Zebra danio', 'Danio rerio', 'fish', 'fresh', [18, 28], [6.5, 8]), // from memory
  entry('bronze_corydoras', 'Bronze corydoras', 'Corydoras aeneus', 'fish', 'fresh', [22, 28], [6, 8]), // from memory
  entry('betta', 'Siamese fighting fish', 'Betta splendens', 'fish', 'fresh', [24, 30], [6, 7.5]), // from memory
  entry('angelfish', 'Freshwater angelfish', 'Pterophyllum scalare', 'fish', 'fresh', [24, 30], [6, 7.5]), // from memory
  entry('goldfish', 'Goldfish', 'Carassius auratus', 'fish', 'fresh', [10, 24], [7, 8]), // from memory
  entry('white_cloud', 'White Cloud Mountain minnow', 'Tanichthys albonubes', 'fish', 'fresh', [14, 22], [6, 8]), // from memory
  entry('harlequin_rasbora', 'Harlequin rasbora', 'Trigonostigma heteromorpha', 'fish', 'fresh', [22, 27], [6, 7.5]), // from memory
  entry('ocellaris_clownfish', 'Ocellaris clownfish', 'Amphiprion ocellaris', 'fish', 'marine', [24, 27], [8, 8.5]), // from memory
  entry('cherry_shrimp', 'Cherry shrimp', 'Neocaridina davidi', 'invertebrate', 'fresh', [18, 27], [6.5, 8]), // from memory
  entry('java_fern', 'Java fern', 'Microsorum pteropus', 'plant', 'fresh', [18, 28], [6, 7.5]), // from memory
  entry('anubias', 'Anubias', 'Anubias barteri', 'plant', 'fresh', [22, 28], [6, 7.5]), // from memory
  entry('java_moss', 'Java moss', 'Taxiphyllum barbieri', 'plant', 'fresh', [18, 28], [5.5, 8]), // from memory
  entry('hornwort', 'Hornwort', 'Ceratophyllum demersum', 'plant', 'fresh', [15, 30], [6, 7.5]), // from memory
]

export const SPECIES_KEYS = SPECIES.map((s) => s.key)

const byKey = new Map(SPECIES.map((s) => [s.key, s]))
export function speciesByKey(key: string): Species | undefined {
  return byKey.get(key)
}
