import type { Page } from '@shared/schemas/common'
import type { PublicTank, TankInput, TankKind, TankListItem, TankStage, TankUpdate } from '@shared/schemas/tanks'
import type { TANK_SORT_KEYS } from '@shared/schemas/tanks'
import { http } from './client'

export type TankSortKey = (typeof TANK_SORT_KEYS)[number]

export interface TankListParams {
  page?: number
  pageSize?: number
  search?: string
  siteId?: number | null
  stage?: TankStage | null
  kind?: TankKind | null
  sortBy?: TankSortKey
  sortDesc?: boolean
  includeArchived?: boolean
}

/** Query strings carry only what is set; the server's schema supplies the defaults. */
function toQuery(params: TankListParams): Record<string, string> {
  const query: Record<string, string> = {}
  if (params.page) query.page = String(params.page)
  if (params.pageSize) query.pageSize = String(params.pageSize)
  if (params.search?.trim()) query.search = params.search.trim()
  if (params.siteId) query.siteId = String(params.siteId)
  if (params.stage) query.stage = params.stage
  if (params.kind) query.kind = params.kind
  if (params.sortBy) query.sortBy = params.sortBy
  if (params.sortDesc != null) query.sortDesc = String(params.sortDesc)
  if (params.includeArchived != null) query.includeArchived = String(params.includeArchived)
  return query
}

export async function listTanks(params: TankListParams = {}): Promise<Page<TankListItem>> {
  return (await http.get<Page<TankListItem>>('/tanks', { params: toQuery(params) })).data
}

export async function getTank(id: number): Promise<PublicTank> {
  return (await http.get<PublicTank>(`/tanks/${id}`)).data
}

export async function createTank(input: TankInput): Promise<PublicTank> {
  return (await http.post<PublicTank>('/tanks', input)).data
}

export async function updateTank(id: number, input: TankUpdate): Promise<PublicTank> {
  return (await http.patch<PublicTank>(`/tanks/${id}`, input)).data
}

export async function archiveTank(id: number): Promise<PublicTank> {
  return (await http.post<PublicTank>(`/tanks/${id}/archive`)).data
}

export async function unarchiveTank(id: number): Promise<PublicTank> {
  return (await http.post<PublicTank>(`/tanks/${id}/unarchive`)).data
}

/** Numbered copies of a tank with its size, equipment, targets, rules and care tasks. */
export async function duplicateTank(id: number, count: number): Promise<{ items: PublicTank[] }> {
  return (await http.post<{ items: PublicTank[] }>(`/tanks/${id}/duplicate`, { count })).data
}

/** Tanks from a CSV sheet (name, site, kind, volume, set point); all rows or none. */
export async function importTanks(csv: string): Promise<{ items: PublicTank[] }> {
  return (await http.post<{ items: PublicTank[] }>('/tanks/import', { csv })).data
}
