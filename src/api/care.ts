import type { z } from 'zod'
import type { AcclimationPlan } from '@shared/care/acclimation'
import type { CyclingStatus } from '@shared/care/cycling'
import type { CareTaskKind, CareValues } from '@shared/care/defaults'
import type { CareDue, CareRecurrence } from '@shared/care/due'
import type { QuarantineStatus, StockingWarning } from '@shared/care/livestock'
import type { Species, SpeciesCategory } from '@shared/care/species'
import type { LabelRate, WaterChangePlan } from '@shared/chemistry/water-change'
import type {
  CareLogKind, careLogInputSchema, careTaskDoneSchema, careTaskInputSchema, careTaskSnoozeSchema, careTaskUpdateSchema,
  livestockInputSchema, livestockUpdateSchema, waterChangeFinishSchema, waterChangePlanSchema, waterChangeStartSchema,
} from '@shared/schemas/care'
import { http } from './client'

// Request bodies are what the client sends, before the server's defaults are filled in.
export type CareTaskInput = z.input<typeof careTaskInputSchema>
export type CareTaskUpdate = z.input<typeof careTaskUpdateSchema>
export type CareTaskDoneInput = z.input<typeof careTaskDoneSchema>
export type CareTaskSnoozeInput = z.input<typeof careTaskSnoozeSchema>
export type CareLogInput = z.input<typeof careLogInputSchema>
export type WaterChangePlanInput = z.input<typeof waterChangePlanSchema>
export type WaterChangeStartInput = z.input<typeof waterChangeStartSchema>
export type WaterChangeFinishInput = z.input<typeof waterChangeFinishSchema>
export type LivestockInput = z.input<typeof livestockInputSchema>
export type LivestockUpdate = z.input<typeof livestockUpdateSchema>
export type { LabelRate }

export interface PublicCareTask {
  id: number
  tankId: number
  kind: CareTaskKind
  title: string
  recurrence: CareRecurrence
  defaultValues: CareValues
  startsOn: string | null
  lastDoneAt: string | null
  lastDoneBy: number | null
  snoozedUntil: string | null
  snoozeReason: string | null
  active: boolean
  /** null when the task is switched off. */
  due: CareDue | null
}

export interface CareTodayTask extends PublicCareTask {
  tank: { id: number; name: string }
  site: { id: number; name: string; timeZone: string }
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

export async function listCareTasks(tankId: number): Promise<PublicCareTask[]> {
  return (await http.get<PublicCareTask[]>(`/tanks/${tankId}/care-tasks`)).data
}

export async function createCareTask(tankId: number, input: CareTaskInput): Promise<PublicCareTask> {
  return (await http.post<PublicCareTask>(`/tanks/${tankId}/care-tasks`, input)).data
}

export async function updateCareTask(id: number, changes: CareTaskUpdate): Promise<PublicCareTask> {
  return (await http.patch<PublicCareTask>(`/care-tasks/${id}`, changes)).data
}

export async function markCareTaskDone(id: number, input: CareTaskDoneInput = {}): Promise<{ task: PublicCareTask; logEntry: PublicCareLogEntry }> {
  return (await http.post<{ task: PublicCareTask; logEntry: PublicCareLogEntry }>(`/care-tasks/${id}/done`, input)).data
}

export interface CareTaskDoneOutcome {
  id: number
  /** `already_done`: someone ticked it after the list was loaded; nothing was logged twice. */
  outcome: 'done' | 'already_done'
  doneAt: string | null
  doneBy: { id: number; name: string } | null
  task: PublicCareTask
}

/** Several tasks done in one transaction; each names the "last done" the list showed. */
export async function markCareTasksDone(tasks: Array<{ id: number; seenLastDoneAt: string | null }>, notes = ''): Promise<CareTaskDoneOutcome[]> {
  return (await http.post<{ results: CareTaskDoneOutcome[] }>('/care-tasks/done', { tasks, notes })).data.results
}

export async function snoozeCareTask(id: number, input: CareTaskSnoozeInput): Promise<PublicCareTask> {
  return (await http.post<PublicCareTask>(`/care-tasks/${id}/snooze`, input)).data
}

export async function getCareToday(query: { siteId: number } | { mine: true }): Promise<CareToday> {
  const params = 'siteId' in query ? { siteId: String(query.siteId) } : { mine: 'true' }
  return (await http.get<CareToday>('/care/today', { params })).data
}

export async function listSpecies(): Promise<Species[]> {
  return (await http.get<Species[]>('/care/species')).data
}

export async function listCareLog(tankId: number, range: { from?: Date; to?: Date } = {}): Promise<PublicCareLogEntry[]> {
  const params: Record<string, string> = {}
  if (range.from) params.from = range.from.toISOString()
  if (range.to) params.to = range.to.toISOString()
  return (await http.get<PublicCareLogEntry[]>(`/tanks/${tankId}/care-log`, { params })).data
}

export async function addCareLogEntry(tankId: number, input: CareLogInput): Promise<PublicCareLogEntry> {
  return (await http.post<PublicCareLogEntry>(`/tanks/${tankId}/care-log`, input)).data
}

export async function listWaterChanges(tankId: number): Promise<PublicWaterChange[]> {
  return (await http.get<PublicWaterChange[]>(`/tanks/${tankId}/water-changes`)).data
}

export async function planWaterChange(tankId: number, input: WaterChangePlanInput): Promise<WaterChangePlanResult> {
  return (await http.post<WaterChangePlanResult>(`/tanks/${tankId}/water-changes/plan`, input)).data
}

export async function startWaterChange(tankId: number, input: WaterChangeStartInput): Promise<PublicWaterChange & { cautions: string[] }> {
  return (await http.post<PublicWaterChange & { cautions: string[] }>(`/tanks/${tankId}/water-changes`, input)).data
}

export async function finishWaterChange(
  id: number,
  input: WaterChangeFinishInput,
): Promise<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }> {
  return (await http.post<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }>(`/water-changes/${id}/finish`, input)).data
}

export async function listLivestock(tankId: number): Promise<LivestockList> {
  return (await http.get<LivestockList>(`/tanks/${tankId}/livestock`)).data
}

export async function addLivestock(tankId: number, input: LivestockInput): Promise<LivestockAdded> {
  return (await http.post<LivestockAdded>(`/tanks/${tankId}/livestock`, input)).data
}

export async function updateLivestock(tankId: number, entryId: number, changes: LivestockUpdate): Promise<PublicLivestockEntry> {
  return (await http.patch<PublicLivestockEntry>(`/tanks/${tankId}/livestock/${entryId}`, changes)).data
}

export async function getCycling(tankId: number): Promise<CyclingResult> {
  return (await http.get<CyclingResult>(`/tanks/${tankId}/cycling`)).data
}

export async function cancelWaterChange(id: number, reason = ''): Promise<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }> {
  return (await http.post<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }>(`/water-changes/${id}/cancel`, { reason })).data
}
