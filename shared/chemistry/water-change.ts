// Water-change planning: how much comes out, where the level ends up, and whether the
// heater stays under water.
import { footprintCm2, waterVolumeLitres, type TankShape } from './volume'
import { requireFitTemperature, requireNonNegative, requirePositive, requirePositiveUpTo } from './validate'

export const HEATER_OFF_CAUTION = 'Switch the heater off about 30 minutes before draining and back on only once it is covered again'
export const UNPLUG_CAUTION = 'Unplug heaters, pumps and lights before putting hands in the water'
export const HEATER_ALREADY_EXPOSED_CAUTION = 'The heater is not fully covered even before draining: top the tank up or lower the heater'
export const LARGE_CHANGE_CAUTION = 'A change this large shifts temperature and water chemistry quickly: match the new water closely'
/** common practice: above half the volume, changes are treated as large. */
export const LARGE_CHANGE_PERCENT = 50

interface WaterChangeBase {
  shape: TankShape
  fillHeightCm: number
  substrateDepthCm: number
  /** height of the top of the heater's immersion mark above the tank floor */
  heaterTopCm?: number
}

export type WaterChangeInput = (WaterChangeBase & { percent: number; litres?: undefined }) | (WaterChangeBase & { litres: number; percent?: undefined })

export interface WaterChangePlan {
  litresOut: number
  percent: number
  levelAfterCm: number
  heaterExposed: boolean
  maxPercentKeepingHeaterCovered: number
  maxLitresKeepingHeaterCovered: number
  cautions: string[]
}

export function planWaterChange(input: WaterChangeInput): WaterChangePlan {
  const { shape, fillHeightCm, substrateDepthCm, heaterTopCm } = input
  const waterLitres = waterVolumeLitres(shape, fillHeightCm, substrateDepthCm)
  const litresPerCm = footprintCm2(shape) / 1000

  let litresOut: number
  if (input.percent !== undefined && input.litres !== undefined) {
    throw new RangeError('give either percent or litres, not both')
  } else if (input.percent !== undefined) {
    requirePositiveUpTo('percent', input.percent, 100, '%')
    litresOut = (waterLitres * input.percent) / 100
  } else if (input.litres !== undefined) {
    requirePositive('litres', input.litres)
    if (input.litres > waterLitres) {
      throw new RangeError(`litres must not exceed the ${waterLitres.toFixed(1)} L of water in the tank (got ${input.litres})`)
    }
    litresOut = input.litres
  } else {
    throw new RangeError('percent or litres is required')
  }

  const levelAfterCm = fillHeightCm - litresOut / litresPerCm
  const cautions = [UNPLUG_CAUTION]
  let heaterExposed = false
  let maxLitres = waterLitres
  if (heaterTopCm !== undefined) {
    requireNonNegative('heaterTopCm', heaterTopCm)
    // Draining can never go below the substrate surface, so a heater buried lower stays covered.
    const floorForHeater = Math.max(heaterTopCm, substrateDepthCm)
    maxLitres = Math.max(0, (fillHeightCm - floorForHeater) * litresPerCm)
    heaterExposed = levelAfterCm < heaterTopCm
    if (heaterTopCm > fillHeightCm) cautions.push(HEATER_ALREADY_EXPOSED_CAUTION)
    // common practice: a heater out of water can crack or overheat, so it is off while exposed.
    if (heaterExposed) cautions.push(HEATER_OFF_CAUTION)
  }
  const percent = (100 * litresOut) / waterLitres
  if (percent > LARGE_CHANGE_PERCENT) cautions.push(LARGE_CHANGE_CAUTION)

  return {
    litresOut,
    percent,
    levelAfterCm,
    heaterExposed,
    maxPercentKeepingHeaterCovered: (100 * maxLitres) / waterLitres,
    maxLitresKeepingHeaterCovered: maxLitres,
    cautions,
  }
}

export interface LabelRate {
  amount: number
  unit: 'mL' | 'drops' | 'g'
  per: 'L' | '10L'
}

/** Scales a product label's dose to a volume; the label stays the authority. */
export function doseForVolume(litres: number, labelRate: LabelRate): { amount: number; unit: LabelRate['unit'] } {
  requirePositive('litres', litres)
  requirePositive('labelRate.amount', labelRate.amount)
  if (labelRate.per !== 'L' && labelRate.per !== '10L') {
    throw new RangeError(`labelRate.per must be 'L' or '10L' (got ${String(labelRate.per)})`)
  }
  const labelLitres = labelRate.per === '10L' ? 10 : 1
  return { amount: (litres / labelLitres) * labelRate.amount, unit: labelRate.unit }
}

export type TemperatureMatch = 'ok' | 'caution' | 'warning'

/** common practice: new water within 1 °C of the tank is fine, up to 2 °C needs care. */
const MATCH_OK_K = 1
const MATCH_CAUTION_K = 2

export function temperatureMismatchAdvice(tankC: number, newWaterC: number): { level: TemperatureMatch; differenceK: number; message: string } {
  requireFitTemperature('tankC', tankC)
  requireFitTemperature('newWaterC', newWaterC)
  const differenceK = newWaterC - tankC
  const gap = Math.abs(differenceK)
  const direction = differenceK > 0 ? 'warmer' : 'colder'
  if (gap <= MATCH_OK_K) {
    return { level: 'ok', differenceK, message: 'New water is within 1 °C of the tank' }
  }
  if (gap <= MATCH_CAUTION_K) {
    return {
      level: 'caution',
      differenceK,
      message: `New water is ${gap.toFixed(1)} °C ${direction} than the tank: add it slowly`,
    }
  }
  return {
    level: 'warning',
    differenceK,
    message: `New water is ${gap.toFixed(1)} °C ${direction} than the tank: bring it within 2 °C before adding`,
  }
}
