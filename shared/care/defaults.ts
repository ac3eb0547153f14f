// The starter care routine a new tank gets. Every interval here is `common practice` among
// keepers, not a published standard; keepers change them per tank afterwards.
import type { CareRecurrence } from './due'

export const CARE_TASK_KINDS = [
  'water_change',
  'filter_rinse',
  'media_replace',
  'glass_clean',
  'substrate_clean',
  'test_kit_check',
  'equipment_service',
  'treatment_dose',
  'treatment_test',
  'other',
] as const
export type CareTaskKind = (typeof CARE_TASK_KINDS)[number]

export type CareValues = Record<string, number | string | boolean>

export interface CareTaskDraft {
  kind: CareTaskKind
  title: string
  recurrence: CareRecurrence
  defaultValues: CareValues
}

/** common practice: 10–15 % of the water weekly; the default sits in that band. */
export const DEFAULT_WATER_CHANGE_PERCENT = 12
/** common practice: rinse the filter sponge in removed tank water about every two weeks. */
export const FILTER_RINSE_DAYS = 14
/** common practice: carbon and other chemical media are spent after 6–8 weeks; the early end. */
export const MEDIA_REPLACE_DAYS = 42
/** common practice: glass and a test-kit check once a week. */
export const WEEKLY_DAYS = 7

const every = (everyDays: number): CareRecurrence => ({ kind: 'interval', everyDays })

/** The default tasks for a tank of this kind and stage; an empty tank has none. */
export function defaultCareTasksFor(tank: { kind: string; stage: string }): CareTaskDraft[] {
  if (tank.stage === 'empty') return []
  const salt = tank.kind === 'marine' || tank.kind === 'brackish'
  return [
    {
      kind: 'water_change',
      title: salt ? 'Partial water change (pre-mixed salt water)' : 'Partial water change',
      recurrence: every(WEEKLY_DAYS),
      defaultValues: { percent: DEFAULT_WATER_CHANGE_PERCENT },
    },
    { kind: 'filter_rinse', title: 'Rinse the filter sponge in removed tank water', recurrence: every(FILTER_RINSE_DAYS), defaultValues: {} },
    { kind: 'media_replace', title: 'Replace carbon or chemical filter media', recurrence: every(MEDIA_REPLACE_DAYS), defaultValues: {} },
    { kind: 'glass_clean', title: 'Clean the glass', recurrence: every(WEEKLY_DAYS), defaultValues: {} },
    {
      kind: 'test_kit_check',
      title: salt ? 'Test-kit check: ammonia, nitrite, nitrate, pH, KH' : 'Test-kit check: ammonia, nitrite, nitrate, pH',
      recurrence: every(WEEKLY_DAYS),
      defaultValues: {},
    },
  ]
}

export const CARE_TASK_KIND_TITLES: Record<CareTaskKind, string> = {
  water_change: 'Partial water change',
  filter_rinse: 'Rinse the filter sponge',
  media_replace: 'Replace filter media',
  glass_clean: 'Clean the glass',
  substrate_clean: 'Clean the substrate',
  test_kit_check: 'Test-kit check',
  equipment_service: 'Equipment service',
  treatment_dose: 'Treatment dose',
  treatment_test: 'Test during a treatment',
  other: 'Care task',
}
