import { expect } from 'vitest'

/** Asserts |actual − expected| ≤ tolerance, with the tolerance stated in the table row. */
export function expectWithin(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `expected ${actual} to be within ${tolerance} of ${expected}`).toBeLessThanOrEqual(tolerance)
}

/** Relative version: |actual/expected − 1| ≤ fraction. */
export function expectRelative(actual: number, expected: number, fraction: number): void {
  const off = Math.abs(actual / expected - 1)
  expect(off, `expected ${actual} to be within ${fraction * 100} % of ${expected}`).toBeLessThanOrEqual(fraction)
}
