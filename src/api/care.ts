import type {
  CareLogBody,
  CareTaskBody,
  CareTaskDoneBody,
  CareTaskDoneOutcome,
  CareTaskSnoozeBody,
  CareTaskUpdateBody,
  CareToday,
  CyclingResult,
  LivestockAdded,
  LivestockBody,
  LivestockList,
  LivestockUpdateBody,
  PublicCareLogEntry,
  PublicCareTask,
  PublicLivestockEntry,
  PublicWaterChange,
  WaterChangeFinishBody,
  WaterChangePlanBody,
  WaterChangePlanResult,
  WaterChangeStartBody,
} from '@shared/schemas/care-api'
import type { Species } from '@shared/care/species'
import { submit, type Waiting } from '@/offline/outbox'
import type { PublicTreatmentCourse, TreatmentCourseBody } from '@shared/schemas/treatment'
import { http } from './client'

export async function listCareTasks(tankId: number): Promise<PublicCareTask[]> {
  return (await http.get<PublicCareTask[]>(`/tanks/${tankId}/care-tasks`)).data
}

export async function createCareTask(tankId: number, input: CareTaskBody): Promise<PublicCareTask> {
  return (await http.post<PublicCareTask>(`/tanks/${tankId}/care-tasks`, input)).data
}

export async function updateCareTask(id: number, changes: CareTaskUpdateBody): Promise<PublicCareTask> {
  return (await http.patch<PublicCareTask>(`/care-tasks/${id}`, changes)).data
}

/**
 * A task ticked off now, naming the "last done" the ticker saw: if someone else ticked it since,
 * the server answers 409 `already_done` instead of logging it twice. Kept on this device and sent
 * later when the server cannot be reached (`Waiting`).
 */
export async function markCareTaskDone(
  task: Pick<PublicCareTask, 'id' | 'tankId' | 'title' | 'lastDoneAt'>,
  input: CareTaskDoneBody = {},
  tankName = `tank ${task.tankId}`,
): Promise<{ task: PublicCareTask; logEntry: PublicCareLogEntry } | Waiting> {
  const body = { ...input, at: input.at ?? new Date().toISOString(), seenLastDoneAt: task.lastDoneAt }
  const label = `Done · ${tankName}: ${task.title}`
  return submit({ kind: 'task-done', tankId: task.tankId, url: `/care-tasks/${task.id}/done`, body, label })
}

/** Several tasks done in one transaction; each names the "last done" the list showed. */
export async function markCareTasksDone(tasks: Array<{ id: number; seenLastDoneAt: string | null }>, notes = ''): Promise<CareTaskDoneOutcome[]> {
  return (await http.post<{ results: CareTaskDoneOutcome[] }>('/care-tasks/done', { tasks, notes })).data.results
}

export async function snoozeCareTask(id: number, input: CareTaskSnoozeBody): Promise<PublicCareTask> {
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

/** A care-log entry timed on this device; kept and sent later when the server cannot be reached (`Waiting`). */
export async function addCareLogEntry(tankId: number, input: CareLogBody, tankName = `tank ${tankId}`): Promise<PublicCareLogEntry | Waiting> {
  const body = { ...input, at: input.at ?? new Date().toISOString() }
  const label = `Care log · ${tankName}: ${input.text || input.kind}`
  return submit<PublicCareLogEntry>({ kind: 'care-log', tankId, url: `/tanks/${tankId}/care-log`, body, label })
}

export async function listWaterChanges(tankId: number): Promise<PublicWaterChange[]> {
  return (await http.get<PublicWaterChange[]>(`/tanks/${tankId}/water-changes`)).data
}

export async function planWaterChange(tankId: number, input: WaterChangePlanBody): Promise<WaterChangePlanResult> {
  return (await http.post<WaterChangePlanResult>(`/tanks/${tankId}/water-changes/plan`, input)).data
}

export async function startWaterChange(tankId: number, input: WaterChangeStartBody): Promise<PublicWaterChange & { cautions: string[] }> {
  return (await http.post<PublicWaterChange & { cautions: string[] }>(`/tanks/${tankId}/water-changes`, input)).data
}

export async function finishWaterChange(
  id: number,
  input: WaterChangeFinishBody,
): Promise<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }> {
  return (await http.post<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }>(`/water-changes/${id}/finish`, input)).data
}

export async function listLivestock(tankId: number): Promise<LivestockList> {
  return (await http.get<LivestockList>(`/tanks/${tankId}/livestock`)).data
}

export async function addLivestock(tankId: number, input: LivestockBody): Promise<LivestockAdded> {
  return (await http.post<LivestockAdded>(`/tanks/${tankId}/livestock`, input)).data
}

export async function updateLivestock(tankId: number, entryId: number, changes: LivestockUpdateBody): Promise<PublicLivestockEntry> {
  return (await http.patch<PublicLivestockEntry>(`/tanks/${tankId}/livestock/${entryId}`, changes)).data
}

export async function getCycling(tankId: number): Promise<CyclingResult> {
  return (await http.get<CyclingResult>(`/tanks/${tankId}/cycling`)).data
}

export async function cancelWaterChange(id: number, reason = ''): Promise<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }> {
  return (await http.post<PublicWaterChange & { logEntry: PublicCareLogEntry; cautions: string[] }>(`/water-changes/${id}/cancel`, { reason })).data
}

export async function listTreatmentCourses(tankId: number): Promise<PublicTreatmentCourse[]> {
  return (await http.get<PublicTreatmentCourse[]>(`/tanks/${tankId}/treatment-courses`)).data
}

export async function startTreatmentCourse(tankId: number, input: TreatmentCourseBody): Promise<PublicTreatmentCourse> {
  return (await http.post<PublicTreatmentCourse>(`/tanks/${tankId}/treatment-courses`, input)).data
}

export async function stopTreatmentCourse(id: number): Promise<PublicTreatmentCourse> {
  return (await http.post<PublicTreatmentCourse>(`/treatment-courses/${id}/stop`)).data
}
