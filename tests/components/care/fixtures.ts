import { HEATER_OFF_CAUTION, UNPLUG_CAUTION } from '@shared/chemistry/water-change'
import type { PublicTank } from '@shared/schemas/tanks'
import type { CareTodayTask, PublicCareTask, WaterChangePlanResult } from '@shared/schemas/care-api'

export const careTank: PublicTank = {
  id: 12,
  name: 'Show tank 3',
  siteId: 3,
  siteName: 'Front shop',
  clientId: null,
  clientName: null,
  kind: 'tropical_freshwater',
  stage: 'established',
  dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 },
  volumeLitres: 200,
  volumeSource: 'dimensions',
  substrateDepthCm: 0,
  heater: { watts: 200, setPointC: 26, topCm: 30 },
  filter: 'canister',
  media: 'sponge, ceramic rings',
  lightSchedule: null,
  targets: { temperature: { min: 24, max: 27 }, ph: { min: 6.5, max: 7.5 } },
  notes: '',
  sortOrder: 0,
  archivedAt: null,
  createdAt: '2026-01-01T00:00:00.000Z',
  updatedAt: '2026-01-01T00:00:00.000Z',
}

/**
 * A server answer for 40 % of this tank, hand-worked like tests/api/care-water-changes.test.ts:
 * floor 100 × 40 cm = 4 L per cm of level (1 L = 1000 cm³), assumed 45 cm fill = 180 L;
 * 40 % = 72 L = 18 cm, so the level falls to 27 cm, below the 30 cm heater top. Keeping the
 * heater covered allows (45 − 30) cm × 4 L = 60 L, a third of the water.
 */
export const heaterExposingPlan: WaterChangePlanResult = {
  tankId: 12,
  waterLitres: 180,
  fillHeight: { cm: 45, source: 'assumed', readingAt: null, note: 'No usable water-level reading in the last 24 h: assumed filled to 90 % of the tank height' },
  heaterTopCm: 30,
  litresOut: 72,
  percent: 40,
  levelAfterCm: 27,
  heaterExposed: true,
  maxPercentKeepingHeaterCovered: 100 / 3,
  maxLitresKeepingHeaterCovered: 60,
  requiresHeaterOffConfirmation: true,
  heaterConfirmAbovePercent: 25,
  dose: null,
  temperature: null,
  treatment: null,
  cautions: [UNPLUG_CAUTION, HEATER_OFF_CAUTION, 'Follow the product label for dechlorinator and other additives; the dose shown only scales the label rate'],
}

/** 10 % of the same 180 L: 18 L = 4.5 cm, level 40.5 cm, heater covered, under the 25 % mark. */
export const gentlePlan: WaterChangePlanResult = {
  ...heaterExposingPlan,
  litresOut: 18,
  percent: 10,
  levelAfterCm: 40.5,
  heaterExposed: false,
  requiresHeaterOffConfirmation: false,
}

export function careTask(id: number, overrides: Partial<PublicCareTask> = {}): PublicCareTask {
  return {
    id,
    tankId: 12,
    kind: 'glass_clean',
    title: `Task ${id}`,
    recurrence: { kind: 'interval', everyDays: 7 },
    defaultValues: {},
    startsOn: null,
    consumableId: null,
    consumableAmount: null,
    endsOn: null,
    treatmentCourseId: null,
    lastDoneAt: '2026-03-01T09:00:00.000Z',
    lastDoneBy: 7,
    snoozedUntil: null,
    snoozeReason: null,
    active: true,
    due: { dueOn: '2026-03-08', status: 'later', daysUntilDue: 5, snoozed: false, today: '2026-03-03' },
    ...overrides,
  }
}

export function todayTask(id: number, tankName: string, due: PublicCareTask['due'], overrides: Partial<PublicCareTask> = {}): CareTodayTask {
  return {
    ...careTask(id, { due, title: `Task ${id}`, ...overrides }),
    tank: { id: 100 + id, name: tankName },
    site: { id: 3, name: 'Front shop', timeZone: 'Europe/Berlin' },
    courseNote: null,
  }
}
