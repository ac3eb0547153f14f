import type { PublicSite, SiteInput } from '@shared/schemas/sites'
import { http } from './client'

export async function listSites(options: { includeArchived?: boolean } = {}): Promise<PublicSite[]> {
  const params = { includeArchived: String(options.includeArchived ?? false) }
  return (await http.get<PublicSite[]>('/sites', { params })).data
}

export async function createSite(input: SiteInput): Promise<PublicSite> {
  return (await http.post<PublicSite>('/sites', input)).data
}

export async function updateSite(id: number, input: Partial<SiteInput>): Promise<PublicSite> {
  return (await http.patch<PublicSite>(`/sites/${id}`, input)).data
}

export async function archiveSite(id: number): Promise<PublicSite> {
  return (await http.post<PublicSite>(`/sites/${id}/archive`)).data
}

export async function unarchiveSite(id: number): Promise<PublicSite> {
  return (await http.post<PublicSite>(`/sites/${id}/unarchive`)).data
}
