import type { PublicVisit, Round, VisitBody, VisitCloseBody, VisitSheet } from '@shared/schemas/visits'
import { http } from './client'

export async function listVisits(params: { clientId?: number; state?: string } = {}): Promise<PublicVisit[]> {
  return (await http.get<PublicVisit[]>('/visits', { params })).data
}

export async function getVisit(id: number): Promise<VisitSheet> {
  return (await http.get<VisitSheet>(`/visits/${id}`)).data
}

export async function createVisit(input: VisitBody): Promise<VisitSheet> {
  return (await http.post<VisitSheet>('/visits', input)).data
}

export async function updateVisit(id: number, input: Partial<VisitBody>): Promise<VisitSheet> {
  return (await http.patch<VisitSheet>(`/visits/${id}`, input)).data
}

export async function deleteVisit(id: number): Promise<void> {
  await http.delete(`/visits/${id}`)
}

export async function startVisit(id: number): Promise<VisitSheet> {
  return (await http.post<VisitSheet>(`/visits/${id}/start`)).data
}

export async function closeVisit(id: number, input: VisitCloseBody): Promise<VisitSheet> {
  return (await http.post<VisitSheet>(`/visits/${id}/close`, input)).data
}

export async function getRound(params: { technicianId?: number; date?: string } = {}): Promise<Round> {
  return (await http.get<Round>('/rounds', { params })).data
}

export async function downloadVisitPdf(id: number): Promise<Blob> {
  return (await http.get<Blob>(`/visits/${id}/report/pdf`, { responseType: 'blob' })).data
}
