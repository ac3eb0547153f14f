// Shared input guards: every chemistry function rejects values its formula was never fitted for.

export function requireFinite(name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number (got ${String(value)})`)
  }
}

export function requirePositive(name: string, value: number): void {
  requireFinite(name, value)
  if (value <= 0) throw new RangeError(`${name} must be greater than 0 (got ${value})`)
}

export function requireNonNegative(name: string, value: number): void {
  requireFinite(name, value)
  if (value < 0) throw new RangeError(`${name} must not be negative (got ${value})`)
}

export function requireInRange(name: string, value: number, min: number, max: number, unit = ''): void {
  requireFinite(name, value)
  if (value < min || value > max) {
    const u = unit ? ` ${unit}` : ''
    throw new RangeError(`${name} must be between ${min} and ${max}${u} (got ${value})`)
  }
}

/** The polynomial fits used here (oxygen, ammonia, carbonate) are published for 0–40 °C. */
export const FIT_MIN_TEMP_C = 0
export const FIT_MAX_TEMP_C = 40

export function requireFitTemperature(name: string, tempC: number): void {
  requireInRange(name, tempC, FIT_MIN_TEMP_C, FIT_MAX_TEMP_C, '°C')
}

export function requirePh(name: string, pH: number): void {
  requireInRange(name, pH, 0, 14)
}

/** For quantities where 0 is meaningless but an upper limit applies (percent, lift in K). */
export function requirePositiveUpTo(name: string, value: number, max: number, unit = ''): void {
  requirePositive(name, value)
  if (value > max) {
    const u = unit ? ` ${unit}` : ''
    throw new RangeError(`${name} must be at most ${max}${u} (got ${value})`)
  }
}
