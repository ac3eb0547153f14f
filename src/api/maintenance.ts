import type { MaintenanceInput, PublicMaintenanceWindow } from '@shared/schemas/maintenance'
import { http } from './client'

export async function listMaintenance(siteId: number, range: { from: Date; to: Date }): Promise<PublicMaintenanceWindow[]> {
  const params = { from: range.from.toISOString(), to: range.to.toISOString() }
  return (await http.get<PublicMaintenanceWindow[]>(`/sites/${siteId}/maintenance-windows`, { params })).data
}

export async function createMaintenance(siteId: number, input: Partial<MaintenanceInput>): Promise<PublicMaintenanceWindow> {
  return (await http.post<PublicMaintenanceWindow>(`/sites/${siteId}/maintenance-windows`, input)).data
}

export async function cancelMaintenance(id: number): Promise<PublicMaintenanceWindow> {
  return (await http.post<PublicMaintenanceWindow>(`/maintenance-windows/${id}/cancel`)).data
}
