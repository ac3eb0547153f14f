import { CONTRACT_VERSION, readingsTopic } from '@shared/ingest/contract'
import { METRICS, type MetricKey } from '@shared/metrics/registry'
import type { PublicDevice } from '@shared/schemas/devices'

/** The embedded broker's default port; a site running its own broker says otherwise. */
export const DEFAULT_MQTT_PORT = 1883

const EXAMPLE_VALUES: Partial<Record<MetricKey, number>> = { temperature: 25.2, ph: 7.1, light: 800, water_level: 38.5 }

function examplePayload(device: Pick<PublicDevice, 'metrics'>, now: Date): string {
  const metric = device.metrics[0] ?? 'temperature'
  return JSON.stringify({
    v: CONTRACT_VERSION,
    readings: [{ metric, value: EXAMPLE_VALUES[metric] ?? 1, unit: METRICS[metric].unit, time: now.toISOString().replace(/\.\d{3}Z$/, 'Z') }],
  })
}

/** A ready-to-run line that publishes one reading, so a keeper can test the device's setup. */
export function mosquittoPubExample(
  device: Pick<PublicDevice, 'id' | 'metrics'>,
  token: string,
  host: string,
  port = DEFAULT_MQTT_PORT,
  now = new Date(),
): string {
  return `mosquitto_pub -h ${host} -p ${port} -u ${device.id} -P '${token}' -q 1 -t ${readingsTopic(device.id)} -m '${examplePayload(device, now)}'`
}

/** The same reading posted over HTTP with the token as a bearer, for a device without MQTT. */
export function curlExample(device: Pick<PublicDevice, 'metrics'>, token: string, origin: string, now = new Date()): string {
  return `curl -X POST ${origin}/api/v1/readings -H 'Authorization: Bearer ${token}' -H 'Content-Type: application/json' -d '${examplePayload(device, now)}'`
}

export { readingsTopic }
