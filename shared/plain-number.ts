/** Plain number of at most `decimals` places: 12.3, 40, 0.05. */
export function plainNumber(value: number, decimals = 1): string {
  return String(Number(value.toFixed(decimals)))
}
