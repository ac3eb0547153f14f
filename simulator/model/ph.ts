// pH: a per-kind baseline, a slow random drift, a photoperiod swing, and a crash scenario.
import type { TankKind } from '@shared/schemas/tanks'
import { gaussian, type Random } from './random'

/** Typical running pH per kind (common practice). */
export const BASELINE_PH: Record<TankKind, number> = {
  tropical_freshwater: 7.2,
  planted: 6.8,
  coldwater: 7.4,
  brackish: 7.9,
  marine: 8.2,
}

/**
 * Half the day–night swing. Plants take up CO2 under light, so pH rises through the
 * photoperiod and falls back overnight; about ±0.2 in a planted tank, far less without
 * dense plants (common practice).
 */
export const SWING_PH: Record<TankKind, number> = {
  tropical_freshwater: 0.05,
  planted: 0.2,
  coldwater: 0.03,
  brackish: 0.03,
  marine: 0.05,
}

/** Time constant of the CO2 swing following the lights. Assumption. */
export const SWING_TAU_S = 90 * 60
/** Slow drift: Ornstein–Uhlenbeck with this spread and time constant. Assumption. */
export const DRIFT_SD = 0.05
export const DRIFT_TAU_S = 7 * 86_400
/** A pH crash (buffer exhausted) loses this much over CRASH_DURATION_S. */
export const CRASH_DROP = 1
export const CRASH_DURATION_S = 3 * 3600

export interface PhState {
  /** Random drift away from the baseline. */
  drift: number
  /** Current photoperiod swing offset. */
  swing: number
}

/** Settled where the lights put it (a tank that has been running), with no drift yet. */
export const initialPhState = (kind: TankKind, lightFraction: number): PhState => ({ drift: 0, swing: SWING_PH[kind] * (2 * lightFraction - 1) })

const smoothstep = (x: number) => x * x * (3 - 2 * x)

/**
 * Drop below normal `elapsedS` into a crash: a smooth S-curve toward −CRASH_DROP. A crash that
 * lasts `lastsS` (the keeper buffers the water) comes back along the same curve over CRASH_DURATION_S.
 */
export function crashOffset(elapsedS: number | null, lastsS = Infinity): number {
  if (elapsedS === null || elapsedS <= 0) return 0
  const fall = (s: number) => -CRASH_DROP * smoothstep(Math.min(1, s / CRASH_DURATION_S))
  if (elapsedS < lastsS) return fall(elapsedS)
  return fall(lastsS) * (1 - smoothstep(Math.min(1, (elapsedS - lastsS) / CRASH_DURATION_S)))
}

/**
 * `swingDtS`: the wall-clock seconds of the step. The swing follows the lights, which keep the site's
 * wall clock at any simulator speed, so it keeps the wall clock too: at 20× a lights-off would
 * otherwise drop the pH in minutes, and a day's-change watch rule would see it as a real change.
 */
export function stepPh(state: PhState, kind: TankKind, lightFraction: number, dtS: number, random: Random, swingDtS = dtS): PhState {
  const target = SWING_PH[kind] * (2 * lightFraction - 1)
  const swing = target + (state.swing - target) * Math.exp(-swingDtS / SWING_TAU_S)
  // Exact OU update, so the spread does not depend on the step size.
  const decay = Math.exp(-dtS / DRIFT_TAU_S)
  const drift = state.drift * decay + DRIFT_SD * Math.sqrt(1 - decay * decay) * gaussian(random)
  return { drift, swing }
}

export function phValue(kind: TankKind, state: PhState, crashElapsedS: number | null, crashLastsS = Infinity): number {
  return BASELINE_PH[kind] + state.drift + state.swing + crashOffset(crashElapsedS, crashLastsS)
}
