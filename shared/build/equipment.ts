// Heater size and placement, filter media order, conditioner dose: the equipment side of a build.
import { heaterWattsRuleOfThumb } from '../chemistry/heater'
import type { TankShape } from '../chemistry/volume'
import { doseForVolume, LARGE_CHANGE_PERCENT, planWaterChange, type LabelRate } from '../chemistry/water-change'
import { requireInRange } from '../chemistry/validate'

/** common practice: a tropical community tank is kept at 26–27 °C. */
export const TROPICAL_SET_POINT_C = { min: 26, max: 27 } as const
/** common practice: heaters are sold in these ratings; the suggestion is the next one up. */
export const HEATER_SIZES_W = [25, 50, 75, 100, 150, 200, 250, 300, 400, 500] as const

/**
 * Rule (common practice): 1 W per litre of water for a lift up to 5 K over the coolest room,
 * in proportion beyond (shared/chemistry/heater), rounded up to a heater size sold.
 * With the room at or above the set point the 1 W/L floor still applies.
 */
export function suggestHeaterWatts(waterLitres: number, setPointC: number, roomC: number): { ruleWatts: number; watts: number; rule: string } {
  requireInRange('setPointC', setPointC, 5, 35, '°C')
  requireInRange('roomC', roomC, 0, 40, '°C')
  const ruleWatts = heaterWattsRuleOfThumb(waterLitres, Math.max(1, setPointC - roomC))
  const size = HEATER_SIZES_W.find((w) => w >= ruleWatts)
  // Past the largest single heater, two or more share the load: round to 50 W steps.
  const watts = size ?? Math.ceil(ruleWatts / 50) * 50
  return { ruleWatts, watts, rule: 'about 1 W per litre for up to 5 °C above the room, more for a larger lift (common practice)' }
}

/**
 * The highest the top of the heater may sit: the level the water-change planner reaches at the
 * largest change it treats as ordinary (LARGE_CHANGE_PERCENT), so the heater stays covered.
 */
export function heaterTopMaxCm(shape: TankShape, fillHeightCm: number, substrateDepthCm: number): number {
  return planWaterChange({ shape, fillHeightCm, substrateDepthCm, percent: LARGE_CHANGE_PERCENT }).levelAfterCm
}

export const HEATER_PLACEMENT_NOTE = `Fully under water even at the lowest level of a ${LARGE_CHANGE_PERCENT} % water change, clear of the substrate, where the flow passes it`

export const ELECTRICAL_CAUTIONS = [
  'Mains electricity near water: give every cable a drip loop below its socket',
  'Plug everything into RCD/GFCI-protected sockets; have a licensed electrician check the circuit and follow local codes',
  'Unplug heaters, pumps and lights before putting hands in the water',
]

/** common practice defaults, in the order the water passes them (mechanical, biological, chemical); the keeper sets the order. */
export const DEFAULT_MEDIA_ORDER = ['Coarse sponge', 'Biological media (ceramic rings)', 'Fine sponge', 'Carbon'] as const

/** The label's rate scaled to the fill volume; the label stays the authority. */
export function conditionerDose(fillLitres: number, labelRate: LabelRate) {
  return { ...doseForVolume(fillLitres, labelRate), forLitres: fillLitres }
}

export const LABEL_CAUTION = 'Conditioners and medications: follow the product label; the dose shown only scales the label rate'
