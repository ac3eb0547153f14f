import type { CreatedInvitation, Invitation, InviteInput, PublicUser, UserChanges } from '@shared/schemas/auth'
import { http } from './client'

export async function listUsers(): Promise<PublicUser[]> {
  return (await http.get<PublicUser[]>('/users')).data
}

export async function updateUser(id: number, changes: UserChanges): Promise<PublicUser> {
  return (await http.patch<PublicUser>(`/users/${id}`, changes)).data
}

export async function listInvitations(): Promise<Invitation[]> {
  return (await http.get<Invitation[]>('/users/invitations')).data
}

export async function createInvitation(input: InviteInput): Promise<CreatedInvitation> {
  return (await http.post<CreatedInvitation>('/users/invitations', input)).data
}

export async function revokeInvitation(id: number): Promise<void> {
  await http.delete(`/users/invitations/${id}`)
}
