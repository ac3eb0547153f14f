// What a test-kit entry says about a tank: each value against the tank's own target band, and
// what keepers usually do when it is outside. The bands are the tank's (editable per tank; the
// starting bands are in shared/schemas/tank-defaults.ts). The advice is `common practice` among
// keepers, not a published standard; the few figures in it are marked where they come from.
import type { MetricKey } from '../metrics/registry'
import type { TankStage, Targets } from '../schemas/tanks'

export type KitVerdictKind = 'in_band' | 'low' | 'high' | 'no_band'
/** `act`: do something today; `watch`: outside the band, look into it; `ok`: nothing to do. */
export type KitVerdictLevel = 'ok' | 'watch' | 'act'

export interface KitVerdict {
  metric: MetricKey
  value: number
  band: { min: number; max: number } | null
  verdict: KitVerdictKind
  level: KitVerdictLevel
  /** One sentence: where the value sits. */
  summary: string
  /** What keepers usually do about it (empty when in band). */
  advice: string[]
}

/** Shown under every verdict: advice is general, a sick fish or a chemical needs the specialist and the label. */
export const KIT_VERDICT_CAUTION =
  'This is what keepers commonly do, not a diagnosis. For sick or dying livestock ask an aquatic veterinarian; for any water conditioner, buffer, fertiliser or medication follow the product label.'

/** Heater advice always carries this: mains electricity next to water. */
export const HEATER_HANDS_CAUTION = 'Unplug the heater before hands go in the water; leave wiring faults to a licensed electrician.'

const RETEST = 'Retest with a fresh sample to rule out a misread or an old reagent.'

// Advice per metric and direction: common practice among keepers.
const ADVICE: Partial<Record<MetricKey, { high?: string[]; low?: string[] }>> = {
  ammonia: {
    high: [
      'Change 25–50 % of the water now with dechlorinated water matched to the tank temperature, and retest within 24 hours (common practice).',
      'Feed lightly or skip a day until it reads zero again.',
      'Look for the source: a dead fish or snail, uneaten food, or a filter that stopped or was cleaned too hard.',
      'Do not replace all the filter media at once: it holds the bacteria that remove ammonia.',
    ],
  },
  nitrite: {
    high: [
      'Change 25–50 % of the water with dechlorinated, temperature-matched water and retest within 24 hours (common practice).',
      'Feed lightly until it reads zero, and check that the filter runs and its media were not all replaced.',
    ],
  },
  nitrate: {
    high: [
      'Bring it down with partial water changes over the next days (common practice: 25–30 % at a time).',
      'Test the tap water too: if it already carries nitrate, changes alone will not get below it.',
      'Check feeding and stocking: nitrate climbs with both.',
    ],
    low: ['Plants need some nitrate: in a planted tank, dose a plant fertiliser as its label says.'],
  },
  ph: {
    high: [
      'Change pH slowly: keepers aim for no more than about 0.2–0.3 a day (common practice, from memory).',
      'Look for the cause: new rock or substrate, KH, or CO₂ off at night. Test KH too.',
    ],
    low: [
      'Change pH slowly: keepers aim for no more than about 0.2–0.3 a day (common practice, from memory).',
      'Test KH: a low KH lets pH fall suddenly. Regular partial water changes restore it.',
      'If CO₂ is injected, check its rate and that it switches off at night.',
    ],
  },
  kh: {
    low: ['A low KH lets pH crash: do a partial water change and test KH again; raise it only with a buffer used as its label says.'],
    high: ['Check the tap water and any rock or substrate that dissolves; partial water changes with softer water bring it down slowly.'],
  },
  gh: {
    low: ['Check what the livestock need; raise it slowly with a remineraliser used as its label says.'],
    high: ['Check the tap water and any rock or substrate; mix in softer water at water changes, slowly.'],
  },
  temperature: {
    high: [
      'Check the heater is not stuck on and its thermostat is set right; check the room temperature and the lights.',
      'Open the lid or run a fan across the surface, and add surface movement: warm water holds less oxygen.',
      'Cool slowly, a degree or two over hours, never with ice straight into the tank (common practice).',
    ],
    low: [
      'Check the heater is on, fully covered by water and big enough for the tank, and that the room is not cold.',
      'Warm slowly, a degree or two over hours (common practice).',
    ],
  },
  oxygen: {
    low: ['Add surface movement or an air stone now, and check the filter flow.', 'Warm water and a heavy stock need more: check the temperature and feeding.'],
  },
  conductivity: {
    high: ['Check for evaporation topped up with salt water or minerals; a partial water change brings it down.'],
    low: ['In a brackish or marine tank, check the salinity with a second instrument before adding salt.'],
  },
}

/** Ammonia and nitrite poison fish at low levels: in a tank with livestock, above the band is an act-today. */
const TOXIC: MetricKey[] = ['ammonia', 'nitrite']

const CYCLING_NOTE =
  'The tank is still cycling, so ammonia and nitrite are expected to rise before the bacteria catch up. Keep livestock out; with fish already in, keep it low with partial water changes (common practice).'

function levelOf(metric: MetricKey, verdict: KitVerdictKind, stage: TankStage): KitVerdictLevel {
  if (verdict === 'in_band' || verdict === 'no_band') return 'ok'
  if (verdict === 'high' && TOXIC.includes(metric) && stage !== 'cycling') return 'act'
  if (metric === 'oxygen' && verdict === 'low') return 'act'
  return 'watch'
}

const figure = (value: number) => String(Number(value.toPrecision(4)))

/**
 * One verdict per value of the entry (canonical units: mg/L, pH, °C, °dKH, °dGH, µS/cm), in the
 * order given. Values outside the band are flagged with the usual steps; `stage` softens ammonia
 * and nitrite in a tank that is still cycling.
 */
export function kitVerdicts(
  values: Partial<Record<MetricKey, number>>,
  targets: Targets,
  stage: TankStage,
  unitOf: (metric: MetricKey) => string = () => '',
): KitVerdict[] {
  const verdicts: KitVerdict[] = []
  for (const [metric, value] of Object.entries(values) as Array<[MetricKey, number | undefined]>) {
    if (value == null || !Number.isFinite(value)) continue
    const band = targets[metric] ?? null
    const verdict: KitVerdictKind = !band ? 'no_band' : value < band.min ? 'low' : value > band.max ? 'high' : 'in_band'
    const unit = unitOf(metric)
    const withUnit = (n: number) => (unit ? `${figure(n)} ${unit}` : figure(n))
    const bandText = band ? `${figure(band.min)}–${withUnit(band.max)}` : ''
    const summary =
      verdict === 'no_band'
        ? `${withUnit(value)}: this tank has no target band for it.`
        : verdict === 'in_band'
          ? `${withUnit(value)}: within the target band ${bandText}.`
          : `${withUnit(value)}: ${verdict === 'high' ? 'above' : 'below'} the target band ${bandText}.`
    const advice = verdict === 'high' || verdict === 'low' ? [...(ADVICE[metric]?.[verdict] ?? [RETEST])] : []
    if (advice.length && TOXIC.includes(metric) && verdict === 'high' && stage === 'cycling') advice.unshift(CYCLING_NOTE)
    if (advice.length && metric === 'temperature') advice.push(HEATER_HANDS_CAUTION)
    if (advice.length && advice[advice.length - 1] !== RETEST) advice.push(RETEST)
    verdicts.push({ metric, value, band, verdict, level: levelOf(metric, verdict, stage), summary, advice })
  }
  return verdicts
}
