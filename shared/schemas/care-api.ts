// The care API's request bodies and answers: tasks, the care log, water changes, livestock and
// cycling. The client reads these shapes and the server's presenters are checked against them.
import type { z } from 'zod'
import type { AcclimationPlan } from '../care/acclimation'
import type { CyclingStatus } from '../care/cycling'
import type { CareTaskKind, CareValues } from '../care/defaults'
import type { CareDue, CareRecurrence } from '../care/due'
import type { QuarantineStatus, StockingWarning } from '../care/livestock'
import type { ConsumableAlert } from './equipment'
import type { Species, SpeciesCategory } from '../care/species'
import type { LabelRate, WaterChangePlan } from '../chemistry/water-change'
import type {
  CareLogKind,
  careLogInputSchema,
  careTaskDoneSchema,
  careTaskInputSchema,
  careTaskSnoozeSchema,
  careTaskUpdateSchema,
  livestockInputSchema,
  livestockUpdateSchema,
  waterChangeFinishSchema,
  waterChangePlanSchema,
  waterChangeStartSchema,
} from './care'

export type { LabelRate }

// Request bodies as a client sends them, before the server fills in the defaults.
export type CareTaskBody = z.input<typeof careTaskInputSchema>
export type CareTaskUpdateBody = z.input<typeof careTaskUpdateSchema>
export type CareTaskDoneBody = z.input<typeof careTaskDoneSchema>
export type CareTaskSnoozeBody = z.input<typeof careTaskSnoozeSchema>
export type CareLogBody = z.input<typeof careLogInputSchema>
export type WaterChangePlanBody = z.input<typeof waterChangePlanSchema>
export type WaterChangeStartBody = z.input<typeof waterChangeStartSchema>
export type WaterChangeFinishBody = z.input<typeof waterChangeFinishSchema>
export type LivestockBody = z.input<typeof livestockInputSchema>
export type LivestockUpdateBody = z.input<typeof livestockUpdateSchema>

export interface PublicCareTask {
  id: number
  tankId: number
  kind: CareTaskKind
  title: string
  recurrence: CareRecurrence
  defaultValues: CareValues
  startsOn: string | null
  /** The last day the task is due (a treatment course's last day); null for a standing task. */
  endsOn: string | null
  treatmentCourseId: number | null
  lastDoneAt: string | null
  lastDoneBy: number | null
  snoozedUntil: string | null
  snoozeReason: string | null
  active: boolean
  consumableId: number | null
  consumableAmount: number | null
  /** null when the task is switched off. */
  due: CareDue | null
}

export interface CareTodayTask extends PublicCareTask {
  tank: { id: number; name: string }
  site: { id: number; name: string; timeZone: string }
  /** What a treatment course running on the tank means for this task (carbon, water changes). */
  courseNote: string | null
}

/** A tank worth a look beyond its tasks: in quarantine, or with new arrivals under watch. */
export interface CareTankToWatch {
  tank: { id: number; name: string }
  site: { id: number; name: string; timeZone: string }
  quarantine: QuarantineStatus | null
  watchUntil: string | null
}

export interface CareToday {
  siteIds: number[]
  /** False when the caller is on duty nowhere: `mine` then lists every site they may see. */
  onDuty: boolean
  tasks: CareTodayTask[]
  watch: CareTankToWatch[]
  /** Consumables running low or past their expiry date at these sites. */
  stock: ConsumableAlert[]
}

export interface PublicCareLogEntry {
  id: number
  tankId: number
  kind: CareLogKind
  at: string
  by: { id: number; name: string } | null
  text: string
  values: CareValues
  careTaskId: number | null
  waterChangeId: number | null
}

export interface WaterChangePlanResult extends WaterChangePlan {
  /** A treatment course running on the tank: how much of its medication the change leaves and the label dose for the new water. */
  treatment: {
    courseId: number
    product: string
    endsOn: string
    percentLeft: number
    doseForNewWater: { amount: number; unit: string; litres: number }
    note: string
  } | null
  tankId: number
  waterLitres: number
  fillHeight: { cm: number; source: 'reading' | 'assumed'; readingAt: string | null; note: string }
  heaterTopCm: number | null
  requiresHeaterOffConfirmation: boolean
  heaterConfirmAbovePercent: number
  dose: { amount: number; unit: LabelRate['unit']; forLitres: number; labelRate: LabelRate } | null
  temperature: {
    tankC: number
    tankSource: 'reading' | 'heater_set_point' | 'target'
    newWaterC: number
    level: 'ok' | 'caution' | 'warning'
    differenceK: number
    message: string
  } | null
}

export interface PublicWaterChange {
  id: number
  tankId: number
  status: 'in_progress' | 'finished' | 'cancelled'
  plan: WaterChangePlanResult
  heaterOffConfirmed: boolean
  temporaryRuleId: number | null
  startedAt: string
  startedBy: number
  finishedAt: string | null
  finishedBy: number | null
  litresReplaced: number | null
  dechlorinatorMl: number | null
  newWaterTempC: number | null
  careLogEntryId: number | null
  cancelledAt: string | null
  cancelledBy: number | null
  cancelReason: string | null
}

export interface PublicLivestockEntry {
  id: number
  tankId: number
  speciesKey: string | null
  species: Species | null
  name: string
  category: SpeciesCategory
  count: number
  losses: number
  /** Animals that left alive: moved to another tank as a new batch, sold, gone to a client. */
  movedOut: number
  /** The batch this one was split from, when part of a batch moved here. */
  parentId: number | null
  addedAt: string
  source: string
  notes: string
  removedAt: string | null
  watchUntil: string | null
}

export interface LivestockList {
  entries: PublicLivestockEntry[]
  watchUntil: string | null
  /** null unless the tank's stage is quarantine. */
  quarantine: QuarantineStatus | null
}

type ReadingSource = { value: number; source: 'reading' | 'heater_set_point' | 'target' }
export interface AcclimationResult extends AcclimationPlan {
  tankTempC: ReadingSource | null
  tankPh: ReadingSource | null
}

export interface LivestockAdded {
  entry: PublicLivestockEntry
  warnings: StockingWarning[]
  /** null for plants. */
  acclimation: AcclimationResult | null
  watchUntil: string | null
}

export interface CyclingResult extends CyclingStatus {
  tankId: number
  stage: string
  newPlants: { addedAt: string; daysSince: number; message: string } | null
  suggestion: string | null
}

export interface CareTaskDoneOutcome {
  id: number
  /** `already_done`: someone ticked it after the list was loaded; nothing was logged twice. */
  outcome: 'done' | 'already_done'
  doneAt: string | null
  doneBy: { id: number; name: string } | null
  task: PublicCareTask
}
