import type { InvitationPreview, Me, Organization, OrganizationSettingsBody, SessionInfo, SignInInput } from '@shared/schemas/auth'
import { http } from './client'

export async function signIn(input: SignInInput): Promise<SessionInfo> {
  return (await http.post<SessionInfo>('/auth/sign-in', input)).data
}

export async function signOut(): Promise<void> {
  await http.post('/auth/sign-out')
}

export async function fetchMe(): Promise<Me> {
  return (await http.get<Me>('/auth/me')).data
}

export async function changePassword(input: { currentPassword: string; newPassword: string }): Promise<void> {
  await http.post('/auth/password', input)
}

export async function fetchInvitation(token: string): Promise<InvitationPreview> {
  return (await http.get<InvitationPreview>(`/invitations/${encodeURIComponent(token)}`)).data
}

export async function acceptInvitation(input: { token: string; password: string; name?: string }): Promise<SessionInfo> {
  return (await http.post<SessionInfo>('/invitations/accept', input)).data
}

/** The answer is the same whether or not the address belongs to an account. */
export async function requestPasswordReset(email: string): Promise<{ message: string }> {
  return (await http.post<{ message: string }>('/auth/password-reset', { email })).data
}

export async function confirmPasswordReset(input: { token: string; password: string }): Promise<void> {
  await http.post('/auth/password-reset/confirm', input)
}

export async function updateOrganization(changes: OrganizationSettingsBody): Promise<Organization> {
  return (await http.patch<Organization>('/organization', changes)).data
}
