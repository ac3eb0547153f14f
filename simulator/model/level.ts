// Water level in cm above the floor: evaporation, automatic top-up, and planned water changes.

/** Evaporation loses about 1–2 % of the water a day under a lid (common practice); we take 1.5 %. */
export const EVAPORATION_FRACTION_PER_DAY = 0.015
/** The top-up switch refills once the level has fallen this far (common practice for float switches). */
export const TOP_UP_TRIGGER_CM = 1
/** Top-up pump rate. Assumption. */
export const TOP_UP_CM_PER_MIN = 0.5

/** A large water change: drain, wait, refill (times in seconds). */
export const WATER_CHANGE = {
  fraction: 0.5,
  drainS: 10 * 60,
  waitS: 10 * 60,
  refillS: 15 * 60,
} as const
export const WATER_CHANGE_TOTAL_S = WATER_CHANGE.drainS + WATER_CHANGE.waitS + WATER_CHANGE.refillS

export interface LevelState {
  levelCm: number
  /** Where the top-up switch and the keeper refill to. */
  targetCm: number
  toppingUp: boolean
}

export const initialLevelState = (targetCm: number): LevelState => ({
  levelCm: targetCm,
  targetCm,
  toppingUp: false,
})

/** Evaporation and top-up over dt seconds. */
export function stepLevel(state: LevelState, dtS: number): LevelState {
  const evaporated = state.levelCm * EVAPORATION_FRACTION_PER_DAY * (dtS / 86_400)
  let levelCm = state.levelCm - evaporated
  let toppingUp = state.toppingUp || levelCm <= state.targetCm - TOP_UP_TRIGGER_CM
  if (toppingUp) {
    levelCm = Math.min(state.targetCm, levelCm + TOP_UP_CM_PER_MIN * (dtS / 60))
    if (levelCm >= state.targetCm) toppingUp = false
  }
  return { ...state, levelCm, toppingUp }
}

/**
 * Level `elapsedS` into a water change that started at `startCm`, or null once the refill is
 * done. Drain and refill run at a steady pump rate.
 */
export function waterChangeLevelCm(elapsedS: number, startCm: number, targetCm: number): number | null {
  if (elapsedS < 0 || elapsedS >= WATER_CHANGE_TOTAL_S) return null
  const lowCm = startCm * (1 - WATER_CHANGE.fraction)
  if (elapsedS < WATER_CHANGE.drainS) return startCm - (startCm - lowCm) * (elapsedS / WATER_CHANGE.drainS)
  const refillElapsed = elapsedS - WATER_CHANGE.drainS - WATER_CHANGE.waitS
  if (refillElapsed < 0) return lowCm
  return lowCm + (targetCm - lowCm) * (refillElapsed / WATER_CHANGE.refillS)
}
