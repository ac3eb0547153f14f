import type { Page } from '@shared/schemas/common'
import type { AckLinkInfo, AckLinkResult, IncidentDetail, IncidentState, PublicIncident } from '@shared/schemas/incidents'
import { http } from './client'

export type IncidentStateFilter = IncidentState | 'unresolved'

export interface IncidentListParams {
  page?: number
  pageSize?: number
  siteId?: number | null
  tankId?: number | null
  state?: IncidentStateFilter | null
  severity?: 'warning' | 'alarm' | null
  from?: Date | null
  to?: Date | null
}

function toQuery(params: IncidentListParams): Record<string, string> {
  const query: Record<string, string> = {}
  if (params.page) query.page = String(params.page)
  if (params.pageSize) query.pageSize = String(params.pageSize)
  if (params.siteId) query.siteId = String(params.siteId)
  if (params.tankId) query.tankId = String(params.tankId)
  if (params.state) query.state = params.state
  if (params.severity) query.severity = params.severity
  if (params.from) query.from = params.from.toISOString()
  if (params.to) query.to = params.to.toISOString()
  return query
}

export async function listIncidents(params: IncidentListParams = {}): Promise<Page<PublicIncident>> {
  return (await http.get<Page<PublicIncident>>('/incidents', { params: toQuery(params) })).data
}

export async function getIncident(id: number): Promise<IncidentDetail> {
  return (await http.get<IncidentDetail>(`/incidents/${id}`)).data
}

export async function acknowledgeIncident(id: number, note: string): Promise<PublicIncident> {
  return (await http.post<PublicIncident>(`/incidents/${id}/acknowledge`, { note })).data
}

export async function resolveIncident(id: number, note: string): Promise<PublicIncident> {
  return (await http.post<PublicIncident>(`/incidents/${id}/resolve`, { note })).data
}

export async function describeAckLink(token: string): Promise<AckLinkInfo> {
  return (await http.get<AckLinkInfo>(`/ack-links/${encodeURIComponent(token)}`)).data
}

export async function redeemAckLink(token: string, note: string): Promise<AckLinkResult> {
  return (await http.post<AckLinkResult>('/ack-links/use', { token, note })).data
}
