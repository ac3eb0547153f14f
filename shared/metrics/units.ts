import { oxygenSolubilityMgL } from '../chemistry/oxygen'
import { SG_REFERENCE_C, specificGravity, salinityFromSpecificGravity } from '../chemistry/seawater-density'
import {
  CACO3_MG_PER_L_PER_GERMAN_DEGREE,
  CM_PER_INCH,
  FAHRENHEIT_OFFSET,
  FAHRENHEIT_PER_KELVIN,
  MEQ_PER_L_PER_GERMAN_DEGREE,
  MMOL_PER_L_PER_GERMAN_DEGREE,
  MOLAR_MASS,
  NH3_PER_NH3_N,
  NH3_PER_NH4,
  NO2_PER_NO2_N,
  NO3_PER_NO3_N,
  PO4_PER_PO4_P,
} from './constants'
import { displayPrecision, METRICS, type MetricKey } from './registry'

export interface ConversionContext {
  temperatureC?: number
  /** Lux that the tank's or device's 100 % light level corresponds to. */
  fullScaleLux?: number
  pressureKPa?: number
}

export type ConversionResult = { ok: true; value: number } | { ok: false; reason: string }

interface UnitConverter {
  toCanonical(value: number, ctx: ConversionContext): ConversionResult
  fromCanonical(value: number, ctx: ConversionContext): ConversionResult
}

const ok = (value: number): ConversionResult => ({ ok: true, value })
const fail = (reason: string): ConversionResult => ({ ok: false, reason })

export function celsiusToFahrenheit(celsius: number): number {
  return celsius * FAHRENHEIT_PER_KELVIN + FAHRENHEIT_OFFSET
}

export function fahrenheitToCelsius(fahrenheit: number): number {
  return (fahrenheit - FAHRENHEIT_OFFSET) / FAHRENHEIT_PER_KELVIN
}

const canonical: UnitConverter = { toCanonical: (v) => ok(v), fromCanonical: (v) => ok(v) }

/** A unit that is a fixed multiple of the canonical one. */
function scaled(canonicalPerUnit: number): UnitConverter {
  return {
    toCanonical: (v) => ok(v * canonicalPerUnit),
    fromCanonical: (v) => ok(v / canonicalPerUnit),
  }
}

/** A percentage of a reference canonical value that only the context can supply. */
function percentOf(reference: (ctx: ConversionContext) => ConversionResult): UnitConverter {
  return {
    toCanonical: (v, ctx) => {
      const ref = reference(ctx)
      return ref.ok ? ok((v / 100) * ref.value) : ref
    },
    fromCanonical: (v, ctx) => {
      const ref = reference(ctx)
      return ref.ok ? ok((v / ref.value) * 100) : ref
    },
  }
}

const isPositiveFinite = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x) && x > 0

const fullScaleLux = (ctx: ConversionContext): ConversionResult =>
  isPositiveFinite(ctx.fullScaleLux) ? ok(ctx.fullScaleLux) : fail("light in 'pct' needs the tank's or device's full-scale lux (fullScaleLux > 0)")

function airSaturatedOxygenMgL(ctx: ConversionContext): ConversionResult {
  const { temperatureC, pressureKPa } = ctx
  if (typeof temperatureC !== 'number' || !Number.isFinite(temperatureC)) {
    return fail("oxygen in 'pct_sat' needs the water temperature in °C (temperatureC)")
  }
  if (pressureKPa !== undefined && !isPositiveFinite(pressureKPa)) {
    return fail('pressureKPa must be a positive number when given')
  }
  try {
    const solubility = oxygenSolubilityMgL(temperatureC, pressureKPa)
    return isPositiveFinite(solubility) ? ok(solubility) : fail(`no oxygen solubility for ${temperatureC} °C`)
  } catch (err) {
    return fail(`no oxygen solubility for ${temperatureC} °C: ${(err as Error).message}`)
  }
}

function readTemperature(ctx: ConversionContext): ConversionResult {
  const { temperatureC } = ctx
  if (typeof temperatureC !== 'number' || !Number.isFinite(temperatureC)) {
    return fail("specific gravity in 'SG_t' needs the water temperature in °C it was read at (temperatureC)")
  }
  return ok(temperatureC)
}

/**
 * A hydrometer calibrated at 25 °C read in water at another temperature: the water's density there
 * over pure water's at 25 °C. Restated at 25/25 °C through the salinity it implies.
 */
const sgAtReadTemperature: UnitConverter = {
  toCanonical: (v, ctx) => {
    const t = readTemperature(ctx)
    if (!t.ok) return t
    try {
      return ok(specificGravity(salinityFromSpecificGravity(v, t.value, SG_REFERENCE_C), SG_REFERENCE_C))
    } catch (err) {
      return fail(`specific gravity ${v} at ${t.value} °C: ${(err as Error).message}`)
    }
  },
  fromCanonical: (v, ctx) => {
    const t = readTemperature(ctx)
    if (!t.ok) return t
    try {
      return ok(specificGravity(salinityFromSpecificGravity(v, SG_REFERENCE_C), t.value, SG_REFERENCE_C))
    } catch (err) {
      return fail(`specific gravity ${v} at ${t.value} °C: ${(err as Error).message}`)
    }
  },
}

const hardness: Record<string, UnitConverter> = {
  'mg/L CaCO3': scaled(1 / CACO3_MG_PER_L_PER_GERMAN_DEGREE),
  'mmol/L': scaled(1 / MMOL_PER_L_PER_GERMAN_DEGREE),
}

const CONVERTERS: { [K in MetricKey]: Record<string, UnitConverter> } = {
  temperature: {
    C: canonical,
    F: {
      toCanonical: (v) => ok(fahrenheitToCelsius(v)),
      fromCanonical: (v) => ok(celsiusToFahrenheit(v)),
    },
  },
  ph: { pH: canonical },
  light: { lux: canonical, pct: percentOf(fullScaleLux) },
  water_level: { cm: canonical, mm: scaled(0.1), in: scaled(CM_PER_INCH) },
  ammonia: { 'mg/L': canonical, 'mg/L NH3-N': scaled(NH3_PER_NH3_N), 'mg/L NH4': scaled(NH3_PER_NH4) },
  nitrite: { 'mg/L': canonical, 'mg/L NO2-N': scaled(NO2_PER_NO2_N) },
  nitrate: { 'mg/L': canonical, 'mg/L NO3-N': scaled(NO3_PER_NO3_N) },
  kh: { dKH: canonical, ...hardness, 'meq/L': scaled(1 / MEQ_PER_L_PER_GERMAN_DEGREE) },
  gh: { dGH: canonical, ...hardness },
  conductivity: { 'uS/cm': canonical, 'mS/cm': scaled(1000) },
  oxygen: { 'mg/L': canonical, pct_sat: percentOf(airSaturatedOxygenMgL) },
  // Practical salinity is unitless; "ppt" is how most keepers write the same number.
  salinity: { PSU: canonical, ppt: canonical },
  specific_gravity: { SG25: canonical, SG_t: sgAtReadTemperature },
  calcium: { 'mg/L': canonical, 'mmol/L': scaled(MOLAR_MASS.Ca) },
  magnesium: { 'mg/L': canonical, 'mmol/L': scaled(MOLAR_MASS.Mg) },
  phosphate: { 'mg/L': canonical, 'mg/L PO4-P': scaled(PO4_PER_PO4_P) },
  copper: { 'mg/L': canonical },
}

/** Unit codes this module can convert for a metric (kept equal to the registry's list by tests). */
export function supportedUnits(metric: MetricKey): string[] {
  return Object.keys(CONVERTERS[metric] ?? {})
}

function convert(direction: keyof UnitConverter, metric: MetricKey, value: number, unit: string, ctx: ConversionContext): ConversionResult {
  const table = CONVERTERS[metric]
  if (!table) return fail(`unknown metric '${String(metric)}'`)
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    return fail(`${metric} value must be a finite number`)
  }
  const converter = Object.hasOwn(table, unit) ? table[unit] : undefined
  if (!converter) {
    return fail(`unknown unit '${unit}' for ${metric}; accepted: ${Object.keys(table).join(', ')}`)
  }
  const result = converter[direction](value, ctx)
  if (result.ok && !Number.isFinite(result.value)) {
    return fail(`${metric} ${value} ${unit} does not convert to a finite number`)
  }
  return result
}

/** Converts a value given in `unit` to the metric's canonical unit. */
export function toCanonical(metric: MetricKey, value: number, unit: string, ctx: ConversionContext = {}): ConversionResult {
  return convert('toCanonical', metric, value, unit, ctx)
}

/** Converts a canonical value to `unit`. */
export function fromCanonical(metric: MetricKey, value: number, unit: string, ctx: ConversionContext = {}): ConversionResult {
  return convert('fromCanonical', metric, value, unit, ctx)
}

/**
 * The number alone (no unit label), in `unit` (canonical when omitted), rounded to the display
 * precision. A unit that cannot be shown is a programming error, so it throws instead of
 * silently printing a canonical number under a different label.
 */
export function formatValue(metric: MetricKey, canonicalValue: number, unit: string = METRICS[metric].unit, ctx: ConversionContext = {}): string {
  const converted = fromCanonical(metric, canonicalValue, unit, ctx)
  if (!converted.ok) throw new RangeError(converted.reason)
  const digits = displayPrecision(metric, unit)
  const text = converted.value.toFixed(digits)
  // "-0.0" reads as a real negative value on a wall screen.
  return Number(text) === 0 ? (0).toFixed(digits) : text
}
