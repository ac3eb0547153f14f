import type { PublicTestKitEntry, TestKitEntryInput } from '@shared/schemas/test-kit'
import { METRICS } from '@shared/metrics/registry'
import { submit, type Waiting } from '@/offline/outbox'
import { http } from './client'

export async function listTestKitEntries(tankId: number, range: { from?: Date; to?: Date } = {}): Promise<PublicTestKitEntry[]> {
  const params: Record<string, string> = {}
  if (range.from) params.from = range.from.toISOString()
  if (range.to) params.to = range.to.toISOString()
  return (await http.get<PublicTestKitEntry[]>(`/tanks/${tankId}/test-kit-entries`, { params })).data
}

const valuesText = (input: TestKitEntryInput) =>
  input.values.map((v) => `${METRICS[v.metric].label} ${v.value}${v.unit && v.unit !== 'pH' ? ` ${v.unit}` : ''}`).join(', ')

/**
 * A new entry, timed on this device when it was made; kept on the device and sent later when the
 * server cannot be reached (`Waiting`).
 */
export async function createTestKitEntry(tankId: number, input: TestKitEntryInput, tankName = `tank ${tankId}`): Promise<PublicTestKitEntry | Waiting> {
  const body = { ...input, takenAt: input.takenAt ?? new Date().toISOString() }
  const label = `Test-kit entry · ${tankName}: ${valuesText(input)}`
  return submit<PublicTestKitEntry>({ kind: 'test-kit', tankId, url: `/tanks/${tankId}/test-kit-entries`, body, label })
}

export async function updateTestKitEntry(id: number, input: TestKitEntryInput): Promise<PublicTestKitEntry> {
  return (await http.put<PublicTestKitEntry>(`/test-kit-entries/${id}`, input)).data
}

export async function deleteTestKitEntry(id: number): Promise<void> {
  await http.delete(`/test-kit-entries/${id}`)
}
