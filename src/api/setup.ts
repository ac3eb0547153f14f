import type { SessionInfo } from '@shared/schemas/auth'
import type { ChecklistStep, SetupInput, SetupState } from '@shared/schemas/setup'
import type { Overview } from '@shared/schemas/overview'
import { http } from './client'

export async function fetchSetupState(): Promise<SetupState> {
  return (await http.get<SetupState>('/setup')).data
}

export async function runSetup(input: SetupInput): Promise<SessionInfo> {
  return (await http.post<SessionInfo>('/setup', input)).data
}

export async function dismissChecklistStep(step: ChecklistStep): Promise<void> {
  await http.post(`/setup/checklist/${step}/dismiss`)
}

export async function fetchOverview(): Promise<Overview> {
  return (await http.get<Overview>('/overview')).data
}
