export const METRIC_KEYS = [
  'temperature',
  'ph',
  'light',
  'water_level',
  'ammonia',
  'nitrite',
  'nitrate',
  'kh',
  'gh',
  'conductivity',
  'oxygen',
  'salinity',
  'specific_gravity',
  'calcium',
  'magnesium',
  'phosphate',
  'copper',
] as const

export type MetricKey = (typeof METRIC_KEYS)[number]

export interface UnitDef {
  label: string
  /** Decimal places when shown in this unit; falls back to the metric's precision. */
  precision?: number
  /** What converting this unit needs beside the value; a CSV column has neither, so imports leave these units out. */
  needs?: 'temperatureC' | 'fullScaleLux'
}

export interface MetricDef {
  key: MetricKey
  label: string
  /** Canonical unit code: what is stored and what rules compare against. */
  unit: string
  unitLabel: string
  /** Every accepted unit code, the canonical one included. */
  units: Record<string, UnitDef>
  /** What a real sensor or kit could report, in canonical units; not a target band. */
  plausible: { min: number; max: number }
  /** Decimal places for display in the canonical unit. */
  precision: number
  /** Commonly entered by a keeper from a test kit or hand meter. */
  kitMetric: boolean
}

// KH and GH share their alternative scales; mmol/L is of CaCO3 (one mole per mole of Ca2+/Mg2+).
const hardnessUnits = (degreeCode: string, degreeLabel: string): Record<string, UnitDef> => ({
  [degreeCode]: { label: degreeLabel },
  'mg/L CaCO3': { label: 'mg/L as CaCO₃', precision: 0 },
  'mmol/L': { label: 'mmol/L as CaCO₃', precision: 2 },
})

export const METRICS: Record<MetricKey, MetricDef> = {
  temperature: {
    key: 'temperature',
    label: 'Temperature',
    unit: 'C',
    unitLabel: '°C',
    units: { C: { label: '°C' }, F: { label: '°F' } },
    plausible: { min: -5, max: 60 },
    precision: 1,
    kitMetric: true,
  },
  ph: {
    key: 'ph',
    label: 'pH',
    unit: 'pH',
    unitLabel: 'pH',
    units: { pH: { label: 'pH' } },
    plausible: { min: 0, max: 14 },
    precision: 2,
    kitMetric: true,
  },
  light: {
    key: 'light',
    label: 'Light',
    unit: 'lux',
    unitLabel: 'lux',
    units: { lux: { label: 'lux' }, pct: { label: '% of full scale', needs: 'fullScaleLux' } },
    // Direct tropical sunlight is around 100 000 lux; sensors saturate not far above.
    plausible: { min: 0, max: 200_000 },
    precision: 0,
    kitMetric: false,
  },
  water_level: {
    key: 'water_level',
    label: 'Water level',
    unit: 'cm',
    unitLabel: 'cm',
    units: { cm: { label: 'cm' }, mm: { label: 'mm', precision: 0 }, in: { label: 'in' } },
    plausible: { min: 0, max: 300 },
    precision: 1,
    kitMetric: false,
  },
  ammonia: {
    key: 'ammonia',
    label: 'Ammonia',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    // Total ammonia (NH3 + NH4+) counted as NH3; an ammonium kit's figure converts by molar mass.
    units: { 'mg/L': { label: 'mg/L' }, 'mg/L NH3-N': { label: 'mg/L NH₃-N' }, 'mg/L NH4': { label: 'mg/L NH₄⁺ (ammonium kit)' } },
    plausible: { min: 0, max: 50 },
    precision: 2,
    kitMetric: true,
  },
  nitrite: {
    key: 'nitrite',
    label: 'Nitrite',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' }, 'mg/L NO2-N': { label: 'mg/L NO₂-N' } },
    plausible: { min: 0, max: 50 },
    precision: 2,
    kitMetric: true,
  },
  nitrate: {
    key: 'nitrate',
    label: 'Nitrate',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' }, 'mg/L NO3-N': { label: 'mg/L NO₃-N' } },
    plausible: { min: 0, max: 500 },
    precision: 1,
    kitMetric: true,
  },
  kh: {
    key: 'kh',
    label: 'KH',
    unit: 'dKH',
    unitLabel: '°dKH',
    // Alkalinity: reef kits give it in °dKH or meq/L.
    units: { ...hardnessUnits('dKH', '°dKH'), 'meq/L': { label: 'meq/L (alkalinity)', precision: 2 } },
    plausible: { min: 0, max: 50 },
    precision: 1,
    kitMetric: true,
  },
  gh: {
    key: 'gh',
    label: 'GH',
    unit: 'dGH',
    unitLabel: '°dGH',
    units: hardnessUnits('dGH', '°dGH'),
    plausible: { min: 0, max: 100 },
    precision: 1,
    kitMetric: true,
  },
  conductivity: {
    key: 'conductivity',
    label: 'Conductivity',
    unit: 'uS/cm',
    unitLabel: 'µS/cm',
    units: { 'uS/cm': { label: 'µS/cm' }, 'mS/cm': { label: 'mS/cm', precision: 3 } },
    // Natural seawater is roughly 50 000 µS/cm; brine-mixing mistakes can go higher.
    plausible: { min: 0, max: 100_000 },
    precision: 0,
    kitMetric: true,
  },
  oxygen: {
    key: 'oxygen',
    label: 'Dissolved oxygen',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' }, pct_sat: { label: '% saturation', precision: 0, needs: 'temperatureC' } },
    // Pure-oxygen injection can supersaturate water several times over air saturation.
    plausible: { min: 0, max: 50 },
    precision: 1,
    kitMetric: true,
  },
  salinity: {
    key: 'salinity',
    label: 'Salinity',
    unit: 'PSU',
    unitLabel: 'PSU',
    // Practical salinity has no unit; keepers write the same number as ‰ or ppt, taken as equal here.
    units: { PSU: { label: 'PSU' }, ppt: { label: 'ppt (‰, as commonly written)' } },
    // Fresh water to a badly mixed brine; the equations behind it are fitted up to 42.
    plausible: { min: 0, max: 42 },
    precision: 1,
    kitMetric: true,
  },
  specific_gravity: {
    key: 'specific_gravity',
    label: 'Specific gravity',
    unit: 'SG25',
    unitLabel: 'SG 25/25 °C',
    // Stored at the reference 25/25 °C; a hydrometer read at the water's temperature converts through salinity.
    units: { SG25: { label: 'SG 25/25 °C' }, SG_t: { label: 'SG read at the water temperature (hydrometer for 25 °C)', needs: 'temperatureC' } },
    // Fresh water to the top of the density equation's fit (salinity 42).
    plausible: { min: 1, max: 1.0316 },
    precision: 4,
    kitMetric: true,
  },
  calcium: {
    key: 'calcium',
    label: 'Calcium',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' }, 'mmol/L': { label: 'mmol/L', precision: 2 } },
    plausible: { min: 0, max: 1000 },
    precision: 0,
    kitMetric: true,
  },
  magnesium: {
    key: 'magnesium',
    label: 'Magnesium',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' }, 'mmol/L': { label: 'mmol/L', precision: 1 } },
    plausible: { min: 0, max: 3000 },
    precision: 0,
    kitMetric: true,
  },
  phosphate: {
    key: 'phosphate',
    label: 'Phosphate',
    unit: 'mg/L',
    unitLabel: 'mg/L PO₄',
    units: { 'mg/L': { label: 'mg/L PO₄' }, 'mg/L PO4-P': { label: 'mg/L PO₄-P', precision: 3 } },
    plausible: { min: 0, max: 20 },
    precision: 2,
    kitMetric: true,
  },
  copper: {
    key: 'copper',
    label: 'Copper',
    unit: 'mg/L',
    unitLabel: 'mg/L',
    units: { 'mg/L': { label: 'mg/L' } },
    plausible: { min: 0, max: 5 },
    precision: 2,
    kitMetric: true,
  },
}

export function isMetricKey(x: unknown): x is MetricKey {
  return typeof x === 'string' && (METRIC_KEYS as readonly string[]).includes(x)
}

/** Decimal places for a metric shown in the given unit (canonical when omitted). */
export function displayPrecision(metric: MetricKey, unit?: string): number {
  const def = METRICS[metric]
  return def.units[unit ?? def.unit]?.precision ?? def.precision
}
