/** A seeded source of numbers in [0, 1): the same seed always replays the same shop. */
export type Random = () => number

/** mulberry32: a tiny 32-bit generator, plenty for simulated sensor noise (not for secrets). */
export function mulberry32(seed: number): Random {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** A stable 32-bit seed from text (FNV-1a), so each tank gets its own stream. */
export function seedFrom(...parts: Array<string | number>): number {
  let hash = 0x811c9dc5
  for (const ch of parts.join('|')) {
    hash ^= ch.codePointAt(0) ?? 0
    hash = Math.imul(hash, 0x01000193) >>> 0
  }
  return hash
}

/** Standard normal deviate by the Box–Muller transform. */
export function gaussian(random: Random): number {
  const u = Math.max(random(), Number.EPSILON)
  const v = random()
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v)
}

export function pick<T>(random: Random, items: readonly T[]): T {
  return items[Math.floor(random() * items.length) % items.length]
}

/** Fisher–Yates shuffle into a new array. */
export function shuffled<T>(random: Random, items: readonly T[]): T[] {
  const out = [...items]
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1))
    ;[out[i], out[j]] = [out[j], out[i]]
  }
  return out
}
