import type { PublicTestKitEntry, TestKitEntryInput } from '@shared/schemas/test-kit'
import { http } from './client'

export async function listTestKitEntries(tankId: number, range: { from?: Date; to?: Date } = {}): Promise<PublicTestKitEntry[]> {
  const params: Record<string, string> = {}
  if (range.from) params.from = range.from.toISOString()
  if (range.to) params.to = range.to.toISOString()
  return (await http.get<PublicTestKitEntry[]>(`/tanks/${tankId}/test-kit-entries`, { params })).data
}

export async function createTestKitEntry(tankId: number, input: TestKitEntryInput): Promise<PublicTestKitEntry> {
  return (await http.post<PublicTestKitEntry>(`/tanks/${tankId}/test-kit-entries`, input)).data
}

export async function updateTestKitEntry(id: number, input: TestKitEntryInput): Promise<PublicTestKitEntry> {
  return (await http.put<PublicTestKitEntry>(`/test-kit-entries/${id}`, input)).data
}

export async function deleteTestKitEntry(id: number): Promise<void> {
  await http.delete(`/test-kit-entries/${id}`)
}
