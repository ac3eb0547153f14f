/** Times are epoch milliseconds throughout; the caller owns the clock. */
export type RuleInput =
  | { type: 'reading'; at: number; value: number; /** Where it came from; a probe's reading when left out. */ source?: 'device' | 'test_kit' | 'import' }
  | { type: 'tick'; at: number }

export interface RuleContext {
  /** Top of the heater, cm above the tank floor; `heater_line` rules stay inert without it. */
  heaterTopCm?: number
  /** The tank's photoperiod; `light_schedule` rules stay inert without it. */
  isScheduledOn?: (atMs: number) => boolean
  /** The longest reporting interval of the tank's probes of the rule's metric, ms (`probe_kit`). */
  probeIntervalMs?: number
}

export type RuleStatus = 'clear' | 'holding' | 'tripped'

/** Small and JSON-serialisable so the engine can keep or persist it per rule and tank. */
export interface RuleState {
  status: RuleStatus
  /** When holding: when the condition began. When tripped: when the rule tripped. */
  since?: number
  lastValue?: number
  /** Worst compared value since the trip; only while tripped. */
  peakValue?: number
  lastReadingAt?: number
  /** `rate` only: readings inside the window, oldest first. */
  window?: Array<[number, number]>
  /** `stuck` only: lowest and highest value since the flat run began (`since`), and whether the probe was seen moving. */
  band?: [number, number]
  moved?: boolean
}

/**
 * `value` is the quantity the rule compares with its limit: the reading for level rules,
 * the signed change across the window for `rate`, whole minutes of silence for `quiet`.
 */
export type RuleEvent =
  | {
      type: 'trip'
      at: number
      value: number
      since: number
      /** Values behind the compared one, kept on the incident's timeline. */ detail?: Record<string, number>
    }
  | { type: 'update'; at: number; value: number; peak: number }
  | { type: 'clear'; at: number; value?: number }

export interface EvaluationResult {
  state: RuleState
  event?: RuleEvent
}

export const initialRuleState = (): RuleState => ({ status: 'clear' })
