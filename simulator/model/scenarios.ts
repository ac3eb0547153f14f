// Which fault each tank plays, and when.

export const SCENARIOS = [
  'none',
  'heater_stuck_on',
  'heater_failed',
  'large_water_change',
  'sensor_quiet',
  'ph_crash',
  'light_stuck_on',
  'duplicates_and_out_of_order',
  'malformed',
] as const
export type Scenario = (typeof SCENARIOS)[number]

export interface ScenarioPlan {
  scenario: Scenario
  /** Simulated seconds after the start before the fault begins. */
  startAfterS: number
  /** Repeat period in simulated seconds (water changes); null = once, then it stays. */
  repeatEveryS: number | null
}

export const isScenario = (x: string): x is Scenario => (SCENARIOS as readonly string[]).includes(x)

/** Sensible timing when a scenario is named without one. */
const DEFAULT_TIMING: Partial<Record<Scenario, Omit<ScenarioPlan, 'scenario'>>> = {
  large_water_change: { startAfterS: 120, repeatEveryS: 3600 },
  sensor_quiet: { startAfterS: 300, repeatEveryS: null },
  ph_crash: { startAfterS: 600, repeatEveryS: null },
}

export const NO_SCENARIO: ScenarioPlan = { scenario: 'none', startAfterS: 0, repeatEveryS: null }

/** `scenario`, `scenario@startS` or `scenario@startS/everyS`. */
export function parseScenarioPlan(text: string): ScenarioPlan {
  const match = /^([a-z_]+)(?:@(\d+(?:\.\d+)?))?(?:\/(\d+(?:\.\d+)?))?$/.exec(text.trim())
  if (!match || !isScenario(match[1])) {
    throw new Error(`unknown scenario '${text.trim()}'; choose from ${SCENARIOS.join(', ')}`)
  }
  const scenario = match[1]
  const defaults = DEFAULT_TIMING[scenario] ?? { startAfterS: 0, repeatEveryS: null }
  const every = match[3] === undefined ? defaults.repeatEveryS : Number(match[3])
  if (every !== null && every <= 0) throw new Error(`repeat period must be above zero in '${text}'`)
  return {
    scenario,
    startAfterS: match[2] === undefined ? defaults.startAfterS : Number(match[2]),
    repeatEveryS: every,
  }
}

/** `Tank name=scenario,Other tank=scenario@60` → tank name → plan. */
export function parseScenarioList(text: string): Map<string, ScenarioPlan> {
  const plans = new Map<string, ScenarioPlan>()
  for (const entry of text.split(',').map((s) => s.trim()).filter(Boolean)) {
    const eq = entry.lastIndexOf('=')
    const name = entry.slice(0, eq).trim()
    if (eq <= 0 || !name) throw new Error(`scenario entry must be 'Tank name=scenario' (got '${entry}')`)
    plans.set(name, parseScenarioPlan(entry.slice(eq + 1)))
  }
  return plans
}

/** The demo shop's faults; every other tank runs normally. */
export const DEMO_SCENARIOS: ReadonlyMap<string, ScenarioPlan> = parseScenarioList(
  [
    'Sales row A1=heater_stuck_on',
    'Display 2 — planted scape=large_water_change@120/3600',
    'Breeding cylinder C1=sensor_quiet@300',
    'Quarantine Q1=ph_crash@600',
  ].join(','),
)

/**
 * Seconds since the fault's current occurrence began, or null when it is not running.
 * Repeating faults restart every period; `activeForS` bounds each occurrence.
 */
export function scenarioElapsedS(plan: ScenarioPlan, simElapsedS: number, activeForS = Infinity): number | null {
  if (plan.scenario === 'none' || simElapsedS < plan.startAfterS) return null
  const since = simElapsedS - plan.startAfterS
  const elapsed = plan.repeatEveryS ? since % plan.repeatEveryS : since
  return elapsed < activeForS ? elapsed : null
}
