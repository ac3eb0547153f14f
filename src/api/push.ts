import type { AlertChannels, PublicPushConfig, PublicPushSubscription, PushSubscriptionBody } from '@shared/schemas/push'
import { http } from './client'

export async function getPushConfig(): Promise<PublicPushConfig> {
  return (await http.get<PublicPushConfig>('/push/config')).data
}

export async function listPushDevices(): Promise<PublicPushSubscription[]> {
  return (await http.get<PublicPushSubscription[]>('/push/subscriptions')).data
}

export async function addPushDevice(body: PushSubscriptionBody): Promise<PublicPushSubscription> {
  return (await http.post<PublicPushSubscription>('/push/subscriptions', body)).data
}

export async function removePushDevice(id: number): Promise<void> {
  await http.delete(`/push/subscriptions/${id}`)
}

export async function testPushDevice(id: number): Promise<void> {
  await http.post(`/push/subscriptions/${id}/test`)
}

export async function getAlertChannels(): Promise<AlertChannels> {
  return (await http.get<AlertChannels>('/push/channels')).data
}

export async function setAlertChannels(channels: AlertChannels): Promise<AlertChannels> {
  return (await http.put<AlertChannels>('/push/channels', channels)).data
}
