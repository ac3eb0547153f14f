import type { OnDutyResponse, OverrideInput, PublicOverride, PublicShift, RosterBackupResponse, RosterWeekResponse, ShiftInput } from '@shared/schemas/roster'
import { http } from './client'

const base = (siteId: number) => `/sites/${siteId}/roster`

export async function listShifts(siteId: number): Promise<PublicShift[]> {
  return (await http.get<PublicShift[]>(`${base(siteId)}/shifts`)).data
}

export async function createShift(siteId: number, input: ShiftInput): Promise<PublicShift> {
  return (await http.post<PublicShift>(`${base(siteId)}/shifts`, input)).data
}

export async function updateShift(siteId: number, shiftId: number, changes: Partial<ShiftInput>): Promise<PublicShift> {
  return (await http.patch<PublicShift>(`${base(siteId)}/shifts/${shiftId}`, changes)).data
}

export async function deleteShift(siteId: number, shiftId: number): Promise<void> {
  await http.delete(`${base(siteId)}/shifts/${shiftId}`)
}

/** Without a range: the one-off changes that are not over yet. */
export async function listOverrides(siteId: number, range: { from?: Date; to?: Date } = {}): Promise<PublicOverride[]> {
  const params: Record<string, string> = {}
  if (range.from) params.from = range.from.toISOString()
  if (range.to) params.to = range.to.toISOString()
  return (await http.get<PublicOverride[]>(`${base(siteId)}/overrides`, { params })).data
}

export async function createOverride(siteId: number, input: OverrideInput): Promise<PublicOverride> {
  return (await http.post<PublicOverride>(`${base(siteId)}/overrides`, input)).data
}

export async function deleteOverride(siteId: number, overrideId: number): Promise<void> {
  await http.delete(`${base(siteId)}/overrides/${overrideId}`)
}

export async function getOnDuty(siteId: number): Promise<OnDutyResponse> {
  return (await http.get<OnDutyResponse>(`${base(siteId)}/on-duty`)).data
}

/** `start` is the Monday of the week, `YYYY-MM-DD` in the site's zone. */
export async function getRosterWeek(siteId: number, start: string): Promise<RosterWeekResponse> {
  return (await http.get<RosterWeekResponse>(`${base(siteId)}/week`, { params: { start } })).data
}

/** `null` goes back to the default: the organization's first active owner. */
export async function setBackup(siteId: number, userId: number | null): Promise<RosterBackupResponse> {
  return (await http.put<RosterBackupResponse>(`${base(siteId)}/backup`, { userId })).data
}
