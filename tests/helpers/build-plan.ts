// A worked build plan for a 60 × 30 × 36 cm planted tank, shared by the API, report and browser tests.
// Its figures are worked by hand in tests/unit/build (water left 47.48 L, heater 75 W, top ≤ 20 cm).
import { formatLocalDate, localDateAt } from '@shared/time/zoned'

export const TANK_60 = { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 } as const

export const PLAN_60 = {
  fillHeightCm: 34,
  glassThicknessMm: 6,
  roomC: 20,
  filter: { name: 'Hang-on filter, 300 L/h', media: ['Coarse sponge', 'Ceramic rings', 'Fine sponge', 'Carbon'] },
  heater: { watts: null, setPointC: 26, topCm: null },
  light: { on: '11:00', off: '19:00' },
  substrate: [
    { material: 'mineral_base', depthCm: 1 },
    { material: 'nutrient_soil', depthCm: 4, bagLitres: 3 },
    { material: 'gravel', depthCm: 1, bagLitres: 2 },
  ],
  hardscape: [
    { kind: 'rock', kg: 5, label: 'Grey stone' },
    { kind: 'wood', litres: 1, label: 'Root' },
  ],
  water: {
    conditioner: 'Tap-water conditioner',
    labelRate: { amount: 5, unit: 'mL', per: '10L' },
    startPh: 7.6,
    temperature: { min: 24, max: 26 },
    ph: { min: 6.8, max: 7.2 },
  },
  plants: true,
  stocking: [
    { label: 'Harlequin rasboras', settleDays: 14, groups: [{ speciesKey: 'harlequin_rasbora', count: 6 }] },
    { label: 'Cherry shrimp', settleDays: 14, groups: [{ speciesKey: 'cherry_shrimp', count: 6 }] },
  ],
}

/** `days` before today on the zone's calendar, YYYY-MM-DD. */
export function localDaysAgo(timeZone: string, days: number, now = Date.now()) {
  return formatLocalDate(localDateAt(timeZone, now - days * 86_400_000))
}
