import type { CreatedWallCredential, PublicWallCredential, WallResponse } from '@shared/schemas/wall'
import { http } from './client'
import { currentToken, storedWallSession } from './session'

/** A display without a person signed in sends its wall key; the request interceptor adds a person's token. */
function wallHeaders(): Record<string, string> {
  if (currentToken()) return {}
  const wall = storedWallSession()
  return wall ? { Authorization: `Bearer ${wall.key}` } : {}
}

export async function getWall(siteId: number): Promise<WallResponse> {
  return (await http.get<WallResponse>(`/sites/${siteId}/wall`, { headers: wallHeaders() })).data
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
