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
  /** How long each occurrence lasts in simulated seconds, after which the node recovers by itself; absent = until the next one. */
  activeForS?: number
}

export const isScenario = (x: string): x is Scenario => (SCENARIOS as readonly string[]).includes(x)

/** Sensible timing when a scenario is named without one. */
const DEFAULT_TIMING: Partial<Record<Scenario, Omit<ScenarioPlan, 'scenario'>>> = {
  large_water_change: { startAfterS: 120, repeatEveryS: 3600 },
  sensor_quiet: { startAfterS: 300, repeatEveryS: null },
  ph_crash: { startAfterS: 600, repeatEveryS: null },
}

export const NO_SCENARIO: ScenarioPlan = { scenario: 'none', startAfterS: 0, repeatEveryS: null }

/** `scenario`, `scenario@startS`, `scenario@startS/everyS`, each optionally `+activeS`. */
export function parseScenarioPlan(text: string): ScenarioPlan {
  const match = /^([a-z_]+)(?:@(\d+(?:\.\d+)?))?(?:\/(\d+(?:\.\d+)?))?(?:\+(\d+(?:\.\d+)?))?$/.exec(text.trim())
  if (!match || !isScenario(match[1])) {
    throw new Error(`unknown scenario '${text.trim()}'; choose from ${SCENARIOS.join(', ')}`)
  }
  const scenario = match[1]
  const defaults = DEFAULT_TIMING[scenario] ?? { startAfterS: 0, repeatEveryS: null }
  const every = match[3] === undefined ? defaults.repeatEveryS : Number(match[3])
  if (every !== null && every <= 0) throw new Error(`repeat period must be above zero in '${text}'`)
  const plan: ScenarioPlan = {
    scenario,
    startAfterS: match[2] === undefined ? defaults.startAfterS : Number(match[2]),
    repeatEveryS: every,
  }
  if (match[4] !== undefined) {
    const active = Number(match[4])
    if (active <= 0 || (every !== null && active >= every)) throw new Error(`active time must be above zero and shorter than the repeat period in '${text}'`)
    plan.activeForS = active
  }
  return plan
}

/** `Tank name=scenario,Other tank=scenario@60` → tank name → plan. */
export function parseScenarioList(text: string): Map<string, ScenarioPlan> {
  const plans = new Map<string, ScenarioPlan>()
  for (const entry of text
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean)) {
    const eq = entry.lastIndexOf('=')
    const name = entry.slice(0, eq).trim()
    if (eq <= 0 || !name) throw new Error(`scenario entry must be 'Tank name=scenario' (got '${entry}')`)
    plans.set(name, parseScenarioPlan(entry.slice(eq + 1)))
  }
  return plans
}

/**
 * The demo shop's faults, placed in real time so they keep a humane pace at any `--speed`: each
 * tank's fault once an hour, each one clearing by itself, spread over the hour. A newcomer's
 * first half hour sees a sensor go quiet and come back, and a stuck heater's alarm open; the
 * heater's escalation and all-clear, a water change and a pH dip follow in the second half.
 * Real seconds after the simulator starts; the heater and pH physics run at the simulated speed.
 */
export const DEMO_FAULTS: ReadonlyArray<{ tank: string; scenario: Scenario; atRealS: number; forRealS?: number }> = [
  { tank: 'Breeding cylinder C1', scenario: 'sensor_quiet', atRealS: 3 * 60, forRealS: 17 * 60 },
  { tank: 'Quarantine Q1', scenario: 'heater_stuck_on', atRealS: 5 * 60, forRealS: 35 * 60 },
  { tank: 'Display 2 — planted scape', scenario: 'large_water_change', atRealS: 42 * 60 },
  { tank: 'Sales row A1', scenario: 'ph_crash', atRealS: 52 * 60, forRealS: 4 * 60 },
]
export const DEMO_FAULT_PERIOD_REAL_S = 3600

/** The demo faults as plans in simulated seconds for a simulator running `speed` times real time. */
export function demoScenarios(speed: number): Map<string, ScenarioPlan> {
  return new Map(
    DEMO_FAULTS.map((f): [string, ScenarioPlan] => {
      const plan: ScenarioPlan = { scenario: f.scenario, startAfterS: f.atRealS * speed, repeatEveryS: DEMO_FAULT_PERIOD_REAL_S * speed }
      if (f.forRealS !== undefined) plan.activeForS = f.forRealS * speed
      return [f.tank, plan]
    }),
  )
}

/**
 * Seconds since the fault's current occurrence began, or null when it is not running.
 * Repeating faults restart every period; `activeForS` (default: the plan's own) bounds each occurrence.
 */
export function scenarioElapsedS(plan: ScenarioPlan, simElapsedS: number, activeForS = plan.activeForS ?? Infinity): number | null {
  if (plan.scenario === 'none' || simElapsedS < plan.startAfterS) return null
  const since = simElapsedS - plan.startAfterS
  const elapsed = plan.repeatEveryS ? since % plan.repeatEveryS : since
  return elapsed < activeForS ? elapsed : null
}
