import { fitLine } from './linear-fit'
import { nernstSlopeMv } from './nernst'

/** One buffer of a pH calibration: its nominal pH at the temperature it was read, and what the probe gave. */
export interface PhCalibrationPoint {
  buffer: number
  temperatureC: number
  /** The probe's pH reading in the buffer (a probe that reports pH, assuming the ideal slope). */
  reading?: number
  /** Or the electrode's potential in the buffer, in millivolts. */
  millivolts?: number
}

/**
 * A slope inside 90–105 % of the ideal is usual for a working glass electrode; outside it the
 * probe wants cleaning or replacing (`common practice`).
 */
export const SLOPE_OK_PERCENT = { min: 90, max: 105 } as const

/**
 * What a probe that reports pH is assumed to do inside: the ideal slope at 25 °C and no offset,
 * so its reading maps back to a potential as E = (7 − pH) · 59.16 mV.
 */
const DEVICE_REFERENCE_C = 25
const NEUTRAL_PH = 7

export interface PhCalibrationResult {
  /** The probe's slope as a percentage of the ideal (Nernst) slope at the buffers' mean temperature. */
  slopePercent: number
  /** The probe's potential at pH 7, mV (asymmetry; ideally 0). */
  offsetMv: number
  /** How far the probe read at pH 7, in pH units (reading − 7). */
  offsetPh: number
  /** Correction of a stored reading: corrected = intercept + gain · raw. */
  gain: number
  intercept: number
  /** Outside SLOPE_OK_PERCENT: clean or replace the probe. */
  slopeOk: boolean
  meanTemperatureC: number
}

/**
 * Two- or three-point calibration against buffers (IUPAC Recommendations 2002, "Measurement of
 * pH. Definition, standards, and procedures", Buck et al., Pure Appl. Chem. 74(11): bracketing
 * two-point method; with three points a least-squares line). Every point gives a potential: the
 * one measured, or the one a pH-reporting probe implies. The fitted potential E = E₇ − s·(pH − 7)
 * gives the slope s (as a percentage of the Nernst slope) and the offset E₇; a later reading maps
 * back through the same line, so the correction is linear in the raw reading.
 */
export function phCalibration(points: ReadonlyArray<PhCalibrationPoint>): PhCalibrationResult {
  if (points.length < 2 || points.length > 3) throw new RangeError('a pH calibration takes two or three buffers')
  const deviceSlope = nernstSlopeMv(DEVICE_REFERENCE_C)
  const potentialOf = (p: PhCalibrationPoint) => {
    if (p.millivolts !== undefined) return p.millivolts
    if (p.reading !== undefined) return (NEUTRAL_PH - p.reading) * deviceSlope
    throw new RangeError('each buffer needs the probe reading or its millivolts')
  }
  const line = fitLine(points.map((p) => ({ x: p.buffer - NEUTRAL_PH, y: potentialOf(p) })))
  const slopeMv = -line.slope
  const offsetMv = line.intercept
  if (!(slopeMv > 0)) throw new RangeError('the probe does not respond to pH: its potential must fall as pH rises')
  const meanTemperatureC = points.reduce((s, p) => s + p.temperatureC, 0) / points.length
  const slopePercent = (slopeMv / nernstSlopeMv(meanTemperatureC)) * 100
  // raw → E = (7 − raw)·deviceSlope; E → pH = 7 + (offsetMv − E) / slopeMv.
  const gain = deviceSlope / slopeMv
  const intercept = NEUTRAL_PH + (offsetMv - NEUTRAL_PH * deviceSlope) / slopeMv
  return {
    slopePercent,
    offsetMv,
    offsetPh: -offsetMv / deviceSlope,
    gain,
    intercept,
    slopeOk: slopePercent >= SLOPE_OK_PERCENT.min && slopePercent <= SLOPE_OK_PERCENT.max,
    meanTemperatureC,
  }
}
