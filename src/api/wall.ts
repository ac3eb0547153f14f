import type { CreatedWallCredential, PublicWallCredential, WallResponse } from '@shared/schemas/wall'
import { http } from './client'
import { fetchWall, takeEarlyWall } from './wall-early'

export { fetchWallTrends } from './wall-early'

export async function getWall(siteId: number): Promise<WallResponse> {
  return takeEarlyWall(siteId) ?? fetchWall(siteId)
}

export async function listWallCredentials(siteId: number): Promise<PublicWallCredential[]> {
  return (await http.get<PublicWallCredential[]>(`/sites/${siteId}/wall-credentials`)).data
}

export async function createWallCredential(siteId: number, name: string): Promise<CreatedWallCredential> {
  return (await http.post<CreatedWallCredential>(`/sites/${siteId}/wall-credentials`, { name })).data
}

export async function revokeWallCredential(id: number): Promise<PublicWallCredential> {
  return (await http.post<PublicWallCredential>(`/wall-credentials/${id}/revoke`)).data
}
