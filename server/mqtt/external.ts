import mqtt from 'mqtt'
import { TOPIC_PREFIX, parseDeviceTopic } from '../../shared/ingest/contract'
import type { DeviceActor } from '../auth/device-tokens'
import type { AppContext } from '../context'

/** Instances of one deployment share the subscription, so each message is taken by one of them. */
export const SHARED_GROUP = 'tankwarden'

/**
 * With MQTT_URL set the app runs no broker of its own: it subscribes to the shop's broker, which
 * authenticates devices and enforces the topic ACL (see README). A message is acknowledged to the
 * broker only after it has been stored, so a crash before that makes the broker deliver it again.
 */
export async function startExternalConsumer(ctx: AppContext, url: string) {
  const { models, logger, readings } = ctx
  const deviceCache = new Map<number, { device: DeviceActor | null; at: number }>()

  async function lookup(deviceId: number): Promise<DeviceActor | null> {
    const cached = deviceCache.get(deviceId)
    if (cached && Date.now() - cached.at < 60_000) return cached.device
    const row = await models.Device.findByPk(deviceId)
    const device = row && !row.revokedAt ? { kind: 'device' as const, deviceId: row.id, organizationId: row.organizationId, tankId: row.tankId } : null
    deviceCache.set(deviceId, { device, at: Date.now() })
    return device
  }
  ctx.events.on('device.revoked', ({ deviceId }) => deviceCache.delete(deviceId))

  const client = await mqtt.connectAsync(url, {
    clientId: `tankwarden-app-${process.pid}-${Math.random().toString(36).slice(2, 8)}`,
    clean: true,
    reconnectPeriod: 2000,
    customHandleAcks: (topic, message, _packet, done) => {
      const target = parseDeviceTopic(topic)
      if (!target || target.channel !== 'readings') return done(0)
      void (async () => {
        const device = await lookup(target.deviceId)
        if (!device) return done(0)
        let body: unknown
        try {
          body = JSON.parse(message.toString('utf8'))
        } catch {
          readings.status.rejected(device.deviceId, 1, 'payload is not valid JSON')
          return done(0)
        }
        await readings.ingest.fromDevice(device, body, { hold: true }).catch((error) => {
          logger.warn({ err: error, deviceId: device.deviceId }, 'external MQTT readings not stored')
        })
        done(0)
      })()
    },
  })
  await client.subscribeAsync(`$share/${SHARED_GROUP}/${TOPIC_PREFIX}/+/readings`, { qos: 1 })
  logger.info({ url: url.replace(/\/\/[^@]*@/, '//***@') }, 'subscribed to the external MQTT broker')
  return { close: () => client.endAsync() }
}
