import type { DeviceInput, DeviceWithToken, PublicDevice } from '@shared/schemas/devices'
import type { CalibrationBody, PublicCalibration } from '@shared/schemas/calibrations'
import { http } from './client'

export async function listDevices(tankId: number): Promise<PublicDevice[]> {
  return (await http.get<PublicDevice[]>('/devices', { params: { tankId: String(tankId) } })).data
}

export async function createDevice(input: DeviceInput): Promise<DeviceWithToken> {
  return (await http.post<DeviceWithToken>('/devices', input)).data
}

export async function rotateDeviceToken(id: number): Promise<DeviceWithToken> {
  return (await http.post<DeviceWithToken>(`/devices/${id}/rotate`)).data
}

export async function revokeDevice(id: number): Promise<PublicDevice> {
  return (await http.post<PublicDevice>(`/devices/${id}/revoke`)).data
}

export async function listCalibrations(deviceId: number): Promise<PublicCalibration[]> {
  return (await http.get<PublicCalibration[]>(`/devices/${deviceId}/calibrations`)).data
}

export async function recordCalibration(deviceId: number, body: CalibrationBody): Promise<PublicCalibration> {
  return (await http.post<PublicCalibration>(`/devices/${deviceId}/calibrations`, body)).data
}
