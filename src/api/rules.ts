import type { PublicRule, PublicSnooze, RuleInput, SnoozeInput } from '@shared/schemas/rules'
import { http } from './client'

export type RuleChanges = Partial<RuleInput>

export async function listTankRules(tankId: number): Promise<PublicRule[]> {
  return (await http.get<PublicRule[]>(`/tanks/${tankId}/rules`)).data
}

export async function createTankRule(tankId: number, input: RuleInput): Promise<PublicRule> {
  return (await http.post<PublicRule>(`/tanks/${tankId}/rules`, input)).data
}

/** This tank's own version of a site-wide rule; `{ enabled: false }` opts the tank out. */
export async function overrideSiteRule(tankId: number, siteRuleId: number, changes: RuleChanges): Promise<PublicRule> {
  return (await http.put<PublicRule>(`/tanks/${tankId}/rules/${siteRuleId}/override`, changes)).data
}

export async function listSiteRules(siteId: number): Promise<PublicRule[]> {
  return (await http.get<PublicRule[]>(`/sites/${siteId}/rules`)).data
}

export async function createSiteRule(siteId: number, input: RuleInput): Promise<PublicRule> {
  return (await http.post<PublicRule>(`/sites/${siteId}/rules`, input)).data
}

export async function updateRule(id: number, changes: RuleChanges): Promise<PublicRule> {
  return (await http.patch<PublicRule>(`/rules/${id}`, changes)).data
}

export async function deleteRule(id: number): Promise<void> {
  await http.delete(`/rules/${id}`)
}

export async function listSnoozes(tankId: number): Promise<PublicSnooze[]> {
  return (await http.get<PublicSnooze[]>(`/tanks/${tankId}/snoozes`)).data
}

export async function createSnooze(tankId: number, input: SnoozeInput): Promise<PublicSnooze> {
  return (await http.post<PublicSnooze>(`/tanks/${tankId}/snoozes`, input)).data
}

export async function cancelSnooze(id: number): Promise<PublicSnooze> {
  return (await http.post<PublicSnooze>(`/snoozes/${id}/cancel`)).data
}
