import type { DeviceWithToken } from '@shared/schemas/devices'

/** Where a device publishes: the external broker when one is set, else this app's host (null) on the embedded broker's port. */
export function brokerAddress(mqtt: { url?: string; port: number }): DeviceWithToken['broker'] {
  if (!mqtt.url) return { host: null, port: mqtt.port }
  const external = new URL(mqtt.url)
  return { host: external.hostname, port: Number(external.port) || (external.protocol === 'mqtts:' ? 8883 : 1883) }
}
