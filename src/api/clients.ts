import type { ClientDetail, ClientInput, PublicClient } from '@shared/schemas/clients'
import { http } from './client'

export async function listClients(options: { includeArchived?: boolean } = {}): Promise<PublicClient[]> {
  const params = { includeArchived: String(options.includeArchived ?? false) }
  return (await http.get<PublicClient[]>('/clients', { params })).data
}

export async function getClient(id: number): Promise<ClientDetail> {
  return (await http.get<ClientDetail>(`/clients/${id}`)).data
}

export async function createClient(input: ClientInput): Promise<ClientDetail> {
  return (await http.post<ClientDetail>('/clients', input)).data
}

export async function updateClient(id: number, input: Partial<ClientInput>): Promise<ClientDetail> {
  return (await http.patch<ClientDetail>(`/clients/${id}`, input)).data
}

export async function archiveClient(id: number, archived: boolean): Promise<ClientDetail> {
  return (await http.post<ClientDetail>(`/clients/${id}/${archived ? 'archive' : 'unarchive'}`)).data
}
