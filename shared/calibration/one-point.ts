/** A linear correction of stored readings: corrected = intercept + gain · raw. */
export interface Correction {
  gain: number
  intercept: number
}

/** A temperature probe against a reference thermometer at one point: an offset (`common practice`). */
export function temperatureOffset(referenceC: number, readingC: number): Correction & { offset: number } {
  const offset = referenceC - readingC
  return { gain: 1, intercept: offset, offset }
}

/** A conductivity probe in one standard solution: a cell factor (`common practice`). */
export function conductivityFactor(standard: number, reading: number): Correction & { factor: number } {
  if (!(reading > 0)) throw new RangeError('the probe reading in the standard must be above zero')
  const factor = standard / reading
  return { gain: factor, intercept: 0, factor }
}

export function applyCorrection(c: Correction, raw: number): number {
  return c.intercept + c.gain * raw
}
