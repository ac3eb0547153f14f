// Water temperature from a lumped heat balance:  m·c·dT/dt = P_heater − U·A·(T − T_room).
import { WATER_SPECIFIC_HEAT_KJ_PER_KG_K, waterDensityKgPerL } from '@shared/chemistry/water-properties'

/** Specific heat of water, J/(kg·K): 4181 (shared/chemistry, CRC Handbook / NIST value). */
export const WATER_SPECIFIC_HEAT_J_PER_KG_K = WATER_SPECIFIC_HEAT_KJ_PER_KG_K * 1000

/**
 * Overall heat-loss coefficient from water to room through glass and the lidded surface,
 * W/(m²·K). from memory: natural convection plus radiation on the air side is about
 * 5–10 W/(m²·K) and dominates the glass and water-side resistances; evaporation under a lid
 * adds a little. 10 also agrees with the trade's "1 W per litre for 5 K" (common practice),
 * which leaves a heater about twice the steady loss of a 60–100 L tank.
 */
export const OVERALL_LOSS_W_PER_M2_K = 10

/** Thermostat switches on below set point − 0.3 K and off above set point + 0.3 K. */
export const THERMOSTAT_HYSTERESIS_K = 0.3

/** Assumption: a shop held at 21 °C, 2 K warmer mid-afternoon and cooler before dawn. */
export const ROOM_MEAN_C = 21
export const ROOM_SWING_K = 2
const ROOM_WARMEST_MINUTE = 15 * 60

/** Room temperature at a local time of day (minutes since midnight), a cosine over 24 h. */
export function roomTemperatureC(minutesOfDay: number): number {
  return ROOM_MEAN_C + ROOM_SWING_K * Math.cos((2 * Math.PI * (minutesOfDay - ROOM_WARMEST_MINUTE)) / 1440)
}

export type HeaterMode = 'normal' | 'stuck_on' | 'failed'

export interface ThermalInputs {
  waterLitres: number
  exposedAreaM2: number
  roomC: number
  heater: { watts: number; setPointC: number } | null
  heaterMode: HeaterMode
  /** A heater above the waterline heats air, not the tank (and may crack). */
  heaterSubmerged: boolean
}

export interface ThermalState {
  waterC: number
  /** The element is drawing power. */
  heaterOn: boolean
}

/** Thermostat with hysteresis: between the two thresholds it keeps its last state. */
export function thermostatOn(waterC: number, setPointC: number, wasOn: boolean): boolean {
  if (waterC < setPointC - THERMOSTAT_HYSTERESIS_K) return true
  if (waterC > setPointC + THERMOSTAT_HYSTERESIS_K) return false
  return wasOn
}

/** Heat capacity of the water, J/K. */
export function heatCapacityJPerK(waterLitres: number, waterC: number): number {
  const densityC = Math.min(40, Math.max(0, waterC))
  return waterLitres * waterDensityKgPerL(densityC) * WATER_SPECIFIC_HEAT_J_PER_KG_K
}

/** Loss conductance U·A, W/K. */
export function lossConductanceWPerK(exposedAreaM2: number): number {
  return OVERALL_LOSS_W_PER_M2_K * exposedAreaM2
}

function heaterState(state: ThermalState, inputs: ThermalInputs): boolean {
  if (!inputs.heater || inputs.heaterMode === 'failed') return false
  if (inputs.heaterMode === 'stuck_on') return true
  return thermostatOn(state.waterC, inputs.heater.setPointC, state.heaterOn)
}

/** One explicit Euler step; callers keep dt small against C/(U·A) (hours), e.g. ≤ 60 s. */
export function stepTemperature(state: ThermalState, inputs: ThermalInputs, dtS: number): ThermalState {
  const heaterOn = heaterState(state, inputs)
  const heaterW = heaterOn && inputs.heaterSubmerged && inputs.heater ? inputs.heater.watts : 0
  const lossW = lossConductanceWPerK(inputs.exposedAreaM2) * (state.waterC - inputs.roomC)
  const capacity = heatCapacityJPerK(inputs.waterLitres, state.waterC)
  return { waterC: state.waterC + ((heaterW - lossW) * dtS) / capacity, heaterOn }
}

/** Temperature after mixing `addedLitres` at `addedC` into `litres` at `waterC`. */
export function mixedTemperatureC(litres: number, waterC: number, addedLitres: number, addedC: number): number {
  const total = litres + addedLitres
  return total > 0 ? (litres * waterC + addedLitres * addedC) / total : addedC
}
