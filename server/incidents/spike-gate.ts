import { PROBE_TRUST, spikeIndexes } from '@shared/calibration'
import { spikeRelease, spikeStep, type SpikeState, type TimedValue } from '@shared/rules/spike-filter'

/**
 * The engine's spike filter over every probe (`${tankId}:${metric}`): which readings the rules
 * see now (shared/rules/spike-filter.ts), and which held readings the clock lets go.
 */
export function createSpikeGate() {
  const states = new Map<string, SpikeState>()
  return {
    pass(key: string, metric: string, reading: TimedValue): TimedValue[] {
      const step = spikeStep(metric, states.get(key) ?? {}, reading)
      states.set(key, step.state)
      return step.pass
    },
    release(at: number): Array<[key: string, readings: TimedValue[]]> {
      const released: Array<[string, TimedValue[]]> = []
      for (const [key, state] of states) {
        const step = spikeRelease(state, at)
        if (!step.pass.length) continue
        states.set(key, step.state)
        released.push([key, step.pass])
      }
      return released
    },
  }
}

/** Stored readings of one metric without the probe spikes the running engine never showed its rules. */
export function withoutSpikes<R extends { value: number; source: string }>(metric: string, list: R[]): R[] {
  const trust = PROBE_TRUST[metric as keyof typeof PROBE_TRUST]
  if (!trust) return list
  const probe = list.filter((r) => r.source === 'device')
  const dropped = new Set(
    spikeIndexes(
      probe.map((r) => r.value),
      trust.spike,
    ).map((i) => probe[i]),
  )
  return dropped.size ? list.filter((r) => !dropped.has(r)) : list
}
