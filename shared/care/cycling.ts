// A tank's nitrogen cycle read from its test-kit results. The rule for "cycled" is common
// practice among keepers, not a published standard: ammonia and nitrite read zero on every
// test for seven consecutive days while nitrate is present.

/** Zero as a test kit can tell it (typical kit resolution), mg/L. */
export const AMMONIA_ZERO_MG_L = 0.02
export const NITRITE_ZERO_MG_L = 0.05
export const CYCLED_AFTER_DAYS = 7
/** common practice: new plants can shed and rot for their first 14–21 days. */
export const NEW_PLANTS_DAYS = { min: 14, max: 21 } as const

export const CYCLED_RULE =
  'Cycled when ammonia (≤ 0.02 mg/L) and nitrite (≤ 0.05 mg/L) read zero on every test for 7 consecutive days with nitrate present (common practice)'

export interface KitTest {
  at: number
  ammonia?: number
  nitrite?: number
  nitrate?: number
}

export type CyclePhase = 'no_data' | 'ammonia' | 'nitrite' | 'nitrate' | 'cycled'

export interface Peak {
  value: number
  at: string
  /** A later test read lower: the peak is behind us. */
  passed: boolean
}

export interface CyclingStatus {
  phase: CyclePhase
  cycled: boolean
  ammoniaPeak: Peak | null
  nitritePeak: Peak | null
  nitrateRising: boolean
  /** First test of the current run of zero ammonia and nitrite, if any. */
  zeroSince: string | null
  zeroDays: number
  daysToGo: number | null
  rule: string
}

const DAY_MS = 86_400_000
const iso = (ms: number) => new Date(ms).toISOString()

function peakOf(tests: KitTest[], metric: 'ammonia' | 'nitrite'): Peak | null {
  let best: KitTest | null = null
  for (const t of tests) {
    const v = t[metric]
    if (v === undefined) continue
    if (!best || v > (best[metric] as number)) best = t
  }
  if (!best || (best[metric] as number) <= 0) return null
  const peak = best[metric] as number
  const passed = tests.some((t) => t.at > best.at && t[metric] !== undefined && (t[metric] as number) < peak)
  return { value: peak, at: iso(best.at), passed }
}

const failsZero = (t: KitTest) => (t.ammonia !== undefined && t.ammonia > AMMONIA_ZERO_MG_L) || (t.nitrite !== undefined && t.nitrite > NITRITE_ZERO_MG_L)

export function cyclingStatus(input: readonly KitTest[]): CyclingStatus {
  const tests = input.filter((t) => t.ammonia !== undefined || t.nitrite !== undefined || t.nitrate !== undefined).sort((a, b) => a.at - b.at)
  const ammoniaPeak = peakOf(tests, 'ammonia')
  const nitritePeak = peakOf(tests, 'nitrite')
  const nitrates = tests.filter((t) => t.nitrate !== undefined).map((t) => t.nitrate as number)
  const nitrateRising = nitrates.length >= 2 && (nitrates.at(-1) as number) > (nitrates[0] as number)
  const base = { ammoniaPeak, nitritePeak, nitrateRising, rule: CYCLED_RULE }
  if (!tests.length) return { ...base, phase: 'no_data', cycled: false, zeroSince: null, zeroDays: 0, daysToGo: null }

  const nitrogenTests = tests.filter((t) => t.ammonia !== undefined || t.nitrite !== undefined)
  let lastFail = -1
  nitrogenTests.forEach((t, i) => {
    if (failsZero(t)) lastFail = i
  })
  const run = nitrogenTests.slice(lastFail + 1)
  const latest = tests.at(-1) as KitTest
  const nitratePresent = (tests.filter((t) => t.nitrate !== undefined).at(-1)?.nitrate ?? 0) > 0
  const coversBoth = run.some((t) => t.ammonia !== undefined) && run.some((t) => t.nitrite !== undefined)
  const zeroSince = run.length && coversBoth ? (run[0] as KitTest).at : null
  const zeroDays = zeroSince === null ? 0 : ((run.at(-1) as KitTest).at - zeroSince) / DAY_MS
  const cycled = zeroSince !== null && zeroDays >= CYCLED_AFTER_DAYS && nitratePresent
  const daysToGo = cycled ? 0 : zeroSince === null ? null : Math.max(0, CYCLED_AFTER_DAYS - zeroDays)

  let phase: CyclePhase
  if (cycled) phase = 'cycled'
  else if (zeroSince !== null && nitratePresent) phase = 'nitrate'
  else if (latest.nitrite !== undefined && latest.nitrite > NITRITE_ZERO_MG_L) phase = 'nitrite'
  else if (nitritePeak && nitritePeak.value > NITRITE_ZERO_MG_L) phase = nitratePresent ? 'nitrate' : 'nitrite'
  else phase = 'ammonia'
  return { ...base, phase, cycled, zeroSince: zeroSince === null ? null : iso(zeroSince), zeroDays, daysToGo }
}

/** common practice note while plants added in the last 21 days settle in; null when none are that new. */
export function newPlantsNote(plantsAddedAt: readonly Date[], now: Date): { addedAt: string; daysSince: number; message: string } | null {
  const recent = plantsAddedAt
    .filter((d) => d.getTime() <= now.getTime() && now.getTime() - d.getTime() < NEW_PLANTS_DAYS.max * DAY_MS)
    .sort((a, b) => b.getTime() - a.getTime())[0]
  if (!recent) return null
  const daysSince = Math.floor((now.getTime() - recent.getTime()) / DAY_MS)
  return {
    addedAt: recent.toISOString(),
    daysSince,
    message: 'New plants can shed leaves and melt back in their first 14–21 days, adding ammonia: test more often and remove dying leaves (common practice)',
  }
}
