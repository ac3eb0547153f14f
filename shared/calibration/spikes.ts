import { bandAround } from './probe-trust'

/** Whether `value` jumped more than `size` from `from` (relative sizes are a fraction of `from`). */
export const jumped = (from: number, value: number, size: number, relative: boolean) => Math.abs(value - from) > bandAround(size, relative, from)

/**
 * Indexes of spikes in a series in time order: a reading far (more than `size`) from both
 * neighbours, which themselves agree within `size`. A step to a new level that stays is no spike.
 */
export function spikeIndexes(values: readonly number[], size: number, relative = false): number[] {
  const spikes: number[] = []
  for (let i = 1; i + 1 < values.length; i++) {
    const [before, v, after] = [values[i - 1], values[i], values[i + 1]]
    if (jumped(before, v, size, relative) && jumped(after, v, size, relative) && !jumped(before, after, size, relative)) spikes.push(i)
  }
  return spikes
}
