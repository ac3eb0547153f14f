import { bandAround, type Band } from './probe-trust'

/** Whether `value` jumped further than `size` from `from`. */
export const jumped = (from: number, value: number, size: Band) => Math.abs(value - from) > bandAround(size, from)

/**
 * Indexes of spikes in a series in time order: a reading far (more than `size`) from both
 * neighbours, which themselves agree within `size`. A step to a new level that stays is no spike.
 */
export function spikeIndexes(values: readonly number[], size: Band): number[] {
  const spikes: number[] = []
  for (let i = 1; i + 1 < values.length; i++) {
    const [before, v, after] = [values[i - 1], values[i], values[i + 1]]
    if (jumped(before, v, size) && jumped(after, v, size) && !jumped(before, after, size)) spikes.push(i)
  }
  return spikes
}
