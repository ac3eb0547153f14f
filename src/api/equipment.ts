import type {
  ConsumableBody,
  ConsumableUpdateBody,
  EquipmentBody,
  EquipmentReplaceBody,
  EquipmentUpdateBody,
  PublicConsumable,
  PublicEquipment,
} from '@shared/schemas/equipment'
import { http } from './client'

export async function listEquipment(tankId: number): Promise<PublicEquipment[]> {
  return (await http.get<PublicEquipment[]>(`/tanks/${tankId}/equipment`)).data
}

export async function addEquipment(tankId: number, input: EquipmentBody): Promise<PublicEquipment> {
  return (await http.post<PublicEquipment>(`/tanks/${tankId}/equipment`, input)).data
}

export async function updateEquipment(id: number, changes: EquipmentUpdateBody): Promise<PublicEquipment> {
  return (await http.patch<PublicEquipment>(`/equipment/${id}`, changes)).data
}

export async function replaceEquipment(id: number, input: EquipmentReplaceBody): Promise<PublicEquipment> {
  return (await http.post<PublicEquipment>(`/equipment/${id}/replace`, input)).data
}

export async function listConsumables(siteId: number): Promise<PublicConsumable[]> {
  return (await http.get<PublicConsumable[]>(`/sites/${siteId}/consumables`)).data
}

export async function addConsumable(siteId: number, input: ConsumableBody): Promise<PublicConsumable> {
  return (await http.post<PublicConsumable>(`/sites/${siteId}/consumables`, input)).data
}

export async function updateConsumable(id: number, changes: ConsumableUpdateBody): Promise<PublicConsumable> {
  return (await http.patch<PublicConsumable>(`/consumables/${id}`, changes)).data
}
